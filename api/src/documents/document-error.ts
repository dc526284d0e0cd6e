import type { FieldError } from '../consent';

export enum DocumentErrorCode {
  InvalidInput = 'invalid-input',
}

/** Bad input to a document builder, with the fields at fault. */
export class DocumentError extends Error {
  constructor(
    readonly code: DocumentErrorCode,
    readonly fieldErrors: FieldError[],
  ) {
    super(fieldErrors.map((e) => `${e.field}: ${e.message}`).join('; '));
    this.name = 'DocumentError';
  }
}
