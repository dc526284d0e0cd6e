import type { FieldError } from '../../common/errors/error-codes';
import { InvalidInputError } from '../../common/errors/invalid-input.error';

export enum DocumentErrorCode {
  InvalidInput = 'invalid-input',
}

/** Bad input to a document builder, with the fields at fault. */
export class DocumentError extends InvalidInputError {
  readonly summary = 'The document cannot be built from these details.';

  constructor(
    readonly code: DocumentErrorCode,
    readonly fieldErrors: FieldError[],
  ) {
    super(fieldErrors.map((e) => `${e.field}: ${e.message}`).join('; '));
    this.name = 'DocumentError';
  }
}
