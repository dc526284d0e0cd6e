import { describe, expect, it } from 'vitest';
import { toProblem } from '../../common/errors/problem.filter';
import { DocumentError, DocumentErrorCode } from './document-error';

describe('DocumentError in the problem filter', () => {
  it('answers bad document input with 400 VALIDATION_FAILED and its field errors, not a 500', () => {
    const error = new DocumentError(DocumentErrorCode.InvalidInput, [
      { field: 'signerName', message: 'must not be empty' },
    ]);
    expect(toProblem(error)).toEqual({
      statusCode: 400,
      code: 'VALIDATION_FAILED',
      message: 'The document cannot be built from these details.',
      errors: [{ field: 'signerName', message: 'must not be empty' }],
    });
  });
});
