import { describe, expect, it } from 'vitest';
import { ApiError, isApiError, toApiProblem } from './problem';

describe('toApiProblem', () => {
  it('keeps the api problem and its extra details', () => {
    const problem = toApiProblem(409, {
      statusCode: 409,
      code: 'CONFLICT',
      message: 'A newer form is in use.',
      currentVersionId: 'v2',
      errors: [{ field: 'versionId', message: 'stale' }, { nonsense: true }],
    });
    expect(problem).toEqual({
      statusCode: 409,
      code: 'CONFLICT',
      message: 'A newer form is in use.',
      currentVersionId: 'v2',
      errors: [{ field: 'versionId', message: 'stale' }],
    });
  });

  it('does not trust a body whose code the api never sends', () => {
    expect(toApiProblem(502, '<html>Bad gateway</html>')).toMatchObject({
      statusCode: 502,
      code: 'UNEXPECTED_RESPONSE',
    });
    expect(toApiProblem(500, { code: 'SOMETHING', message: 'x' })).toMatchObject({ statusCode: 500, code: 'INTERNAL' });
    expect(toApiProblem(401, null).message).toBe('Your session has ended. Please sign in again.');
  });

  it('makes an ApiError that names its code', () => {
    const error = new ApiError(toApiProblem(404, { statusCode: 404, code: 'NOT_FOUND', message: 'No such study.' }));
    expect(isApiError(error, 'NOT_FOUND')).toBe(true);
    expect(isApiError(error, 'CONFLICT')).toBe(false);
    expect(error.statusCode).toBe(404);
  });
});
