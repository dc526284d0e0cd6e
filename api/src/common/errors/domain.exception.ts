import { ErrorCode, FieldError } from './error-codes';

/**
 * Refusals any domain may answer with in the same sense: nothing there by that id, a field is wrong, the role does not
 * allow it. A domain's own refusals get codes of their own in its exception (e.g. `study.exception.ts`).
 */
export type CommonRefusal =
  | 'NOT_FOUND'
  | 'VALIDATION_FAILED'
  | 'FORBIDDEN'
  | 'UNAUTHENTICATED'
  | 'RATE_LIMITED'
  | 'PAYLOAD_TOO_LARGE'
  | 'UNSUPPORTED_MEDIA_TYPE';

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
