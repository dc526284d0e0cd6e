import { describe, expect, it } from 'vitest';
import { ApiError, placeFieldErrors } from './api-error';

describe('placeFieldErrors', () => {
  const fields = ['email', 'name', 'role', 'password'] as const;

  it('places EMAIL_TAKEN on email', () => {
    const error = new ApiError({ statusCode: 409, code: 'EMAIL_TAKEN', message: 'Already in use.' });
    expect(placeFieldErrors(error, fields)).toEqual({
      fields: [{ field: 'email', message: 'Already in use.' }],
      formMessage: null,
    });
  });

  it('places nested field names on their top-level input and keeps the first message per field', () => {
    const error = new ApiError({
      statusCode: 400,
      code: 'VALIDATION_FAILED',
      message: 'Invalid',
      errors: [
        { field: 'name.first', message: 'too long' },
        { field: 'name', message: 'second message' },
        { field: 'active', message: 'not allowed here' },
      ],
    });
    expect(placeFieldErrors(error, fields)).toEqual({
      fields: [{ field: 'name', message: 'too long' }],
      formMessage: 'active: not allowed here',
    });
  });

  it('falls back to the api message when nothing fits a field', () => {
    const error = new ApiError({
      statusCode: 400,
      code: 'OWN_ACCOUNT_PROTECTED',
      message: 'You cannot deactivate yourself.',
    });
    expect(placeFieldErrors(error, fields)).toEqual({ fields: [], formMessage: 'You cannot deactivate yourself.' });
  });

  it('does not put EMAIL_TAKEN on a form without an e-mail field', () => {
    const error = new ApiError({ statusCode: 409, code: 'EMAIL_TAKEN', message: 'Already in use.' });
    expect(placeFieldErrors(error, ['name', 'role'] as const)).toEqual({ fields: [], formMessage: 'Already in use.' });
  });

  it('gives a connection hint for errors that are not from the api', () => {
    expect(placeFieldErrors(new TypeError('Failed to fetch'), fields).formMessage).toMatch(/connection/);
  });
});
