import { describe, expect, it } from 'vitest';
import { ApiError } from '@evenhand/contract';
import { describeProblem, GENERAL_INPUT_PROBLEM, plainFieldMessage } from './problem-message';

const fallback = 'Please type your full name.';

describe("field messages in the person's words", () => {
  it("keeps the api's words when they are plain, as a sentence", () => {
    expect(plainFieldMessage({ field: 'code', message: 'does not match; check it and try again' }, fallback)).toBe(
      'Does not match; check it and try again.',
    );
  });

  it("uses the form's own words when the api names its field, an identifier or a path", () => {
    expect(plainFieldMessage({ field: 'email', message: 'email must be an email' }, fallback)).toBe(fallback);
    expect(plainFieldMessage({ field: 'token', message: 'token is not a sign-in token' }, fallback)).toBe(fallback);
    expect(plainFieldMessage({ field: 'x', message: 'typedName must be your full name' }, fallback)).toBe(fallback);
    expect(plainFieldMessage({ field: 'answers.age', message: 'answers.age must be a number' }, fallback)).toBe(
      fallback,
    );
  });

  it('does not mistake an example address for a path', () => {
    expect(plainFieldMessage({ field: 'email', message: 'use an address such as name@example.com' }, fallback)).toBe(
      'Use an address such as name@example.com.',
    );
  });

  it('gives a general plain sentence for a refusal that would show an internal name', () => {
    const error = new ApiError({
      statusCode: 400,
      code: 'VALIDATION_FAILED',
      message: 'Some fields are not right',
      errors: [{ field: 'token', message: 'token is not a sign-in token' }],
    });
    expect(describeProblem(error)).toBe(GENERAL_INPUT_PROBLEM);
  });
});
