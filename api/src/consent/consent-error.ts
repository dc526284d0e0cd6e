import { InvalidInputError } from '../common/errors/invalid-input.error';

/** One problem with one input field, in words an admin screen can show next to that field. */
export interface FieldError {
  field: string;
  message: string;
}

export enum ConsentErrorCode {
  InvalidTemplate = 'invalid-template',
  InvalidFields = 'invalid-fields',
  InvalidText = 'invalid-text',
}

/** The consent domain's one error for bad input: a code plus the field errors that caused it. */
export class ConsentError extends InvalidInputError {
  readonly summary = 'The consent form cannot be prepared from these details.';

  constructor(
    readonly code: ConsentErrorCode,
    readonly fieldErrors: FieldError[],
  ) {
    super(fieldErrors.map((e) => `${e.field}: ${e.message}`).join('; '));
    this.name = 'ConsentError';
  }
}

export function consentFail(code: ConsentErrorCode, field: string, message: string): never {
  throw new ConsentError(code, [{ field, message }]);
}
