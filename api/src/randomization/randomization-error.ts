import { InvalidInputError } from '../common/errors/invalid-input.error';

/** One problem with one input field, in words an admin screen can show next to that field. */
export interface FieldError {
  field: string;
  message: string;
}

export enum RandomizationErrorCode {
  InvalidParameters = 'invalid-parameters',
  InvalidSeed = 'invalid-seed',
  InvalidCovariates = 'invalid-covariates',
  InvalidInput = 'invalid-input',
}

/** The randomization domain's one error: a code plus the field errors that caused it. */
export class RandomizationError extends InvalidInputError {
  readonly summary = 'The assignment settings are not valid.';

  constructor(
    readonly code: RandomizationErrorCode,
    readonly fieldErrors: FieldError[],
  ) {
    super(fieldErrors.map((e) => `${e.field}: ${e.message}`).join('; '));
    this.name = 'RandomizationError';
  }
}

export function fail(code: RandomizationErrorCode, field: string, message: string): never {
  throw new RandomizationError(code, [{ field, message }]);
}
