import { ErrorCode, FieldError } from './error-codes';

/** Base of every domain's exception; the problem filter turns it into the JSON error shape. */
export class DomainException<Code extends ErrorCode = ErrorCode> extends Error {
  constructor(
    readonly code: Code,
    message: string,
    readonly errors?: FieldError[],
    /** Extra fields a client needs to recover, e.g. the current consent version. */
    readonly details?: Record<string, unknown>,
  ) {
    super(message);
    this.name = new.target.name;
  }
}

/** Raised by the validation pipe and by services that check a field themselves. */
export class ValidationException extends DomainException<'VALIDATION_FAILED'> {
  constructor(errors: FieldError[], message = 'Some fields are missing or invalid.') {
    super('VALIDATION_FAILED', message, errors);
  }
}
