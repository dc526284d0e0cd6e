import { isApiError } from './api-problem';

/** Plain words for a failed request, for people who do not care about status codes. */
export function describeProblem(error: unknown): string {
  if (isApiError(error)) {
    switch (error.code) {
      case 'RATE_LIMITED':
        return 'You have asked several times in a short while. Please wait a few minutes, then try again.';
      case 'VALIDATION_FAILED':
        return error.fieldErrors[0]?.message ?? error.message;
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
