import Stripe from 'stripe';

/**
 * Whether a failed provider call says nothing about the request itself: the provider could not be reached, timed
 * out, failed on its side (5xx) or asked us to slow down (429). Such a call may be tried again with the same
 * Idempotency-Key; anything else is the provider refusing what we asked.
 */
export function isProviderUnavailable(error: unknown): boolean {
  if (error instanceof Stripe.errors.StripeConnectionError || error instanceof Stripe.errors.StripeRateLimitError)
    return true;
  if (error instanceof Stripe.errors.StripeError) {
    const status = error.statusCode ?? 0;
    return status >= 500 || status === 429 || (status === 0 && error.type === 'StripeAPIError');
  }
  return false;
}
