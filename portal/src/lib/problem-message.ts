import { isApiError } from './api-problem';
import { asSentence } from './text';

/** What a form says when the api refused something it cannot point to in words of our own. */
export const GENERAL_INPUT_PROBLEM = 'Something you entered was not accepted. Please check it and try again.';

/**
 * Whether an api message speaks in its own names rather than the person's words: it opens with the field's name
 * ("email must be an email"), or names a code-style identifier (`typedName`, `payMinor`) or a path (`answers.age`).
 */
function speaksInFieldNames(field: string, message: string): boolean {
  const lastName = field.split('.').at(-1) ?? field;
  const opensWithFieldName =
    lastName !== '' && new RegExp(`^${lastName.replace(/[^\w]/g, '')}\\b`).test(message.trim());
  return (
    opensWithFieldName || /\b[a-z]+[A-Z]\w*\b/.test(message) || /(?:^|\s)[a-z]\w*\.[a-z]\w*(?=[\s:]|$)/.test(message)
  );
}

/**
 * A field error from the api as the person should read it: its own words when they are plain ("does not match;
 * check it and try again" becomes a sentence), else the form's own wording for that field.
 */
export function plainFieldMessage(fieldError: { field: string; message: string }, fallback: string): string {
  return speaksInFieldNames(fieldError.field, fieldError.message) ? fallback : asSentence(fieldError.message);
}

/** Plain words for a failed request, for people who do not care about status codes. */
export function describeProblem(error: unknown): string {
  if (isApiError(error)) {
    switch (error.code) {
      case 'RATE_LIMITED':
        return 'You have asked several times in a short while. Please wait a few minutes, then try again.';
      case 'VALIDATION_FAILED': {
        const first = error.fieldErrors[0];
        if (first) return plainFieldMessage(first, GENERAL_INPUT_PROBLEM);
        return speaksInFieldNames('', error.message) ? GENERAL_INPUT_PROBLEM : error.message;
      }
      case 'UNAUTHENTICATED':
        return 'You are no longer signed in. Please sign in again.';
      case 'FORBIDDEN':
        return 'This is not available to your account.';
      case 'NOT_FOUND':
        return 'We could not find what you were looking for.';
      default:
        return error.statusCode >= 500
          ? 'Something went wrong on our side. Please try again in a moment.'
          : error.message;
    }
  }
  // fetch rejects with a TypeError when the network or the server cannot be reached at all.
  if (error instanceof TypeError) return 'We could not reach Evenhand. Check your internet connection and try again.';
  return 'Something unexpected went wrong. Please try again.';
}
