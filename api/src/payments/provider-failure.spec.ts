import Stripe from 'stripe';
import { describe, expect, it } from 'vitest';
import { isProviderUnavailable } from './provider-failure';

// Errors as the SDK itself builds them from a provider answer (StripeError.generate), so the check follows its classes.
const fromAnswer = (statusCode: number, type: string) =>
  Stripe.errors.StripeError.generate({ type, message: 'x', statusCode } as never);

describe('isProviderUnavailable', () => {
  it('is true for an unreachable provider, its server errors and rate limits', () => {
    expect(isProviderUnavailable(new Stripe.errors.StripeConnectionError({ message: 'ECONNREFUSED' } as never))).toBe(
      true,
    );
    expect(isProviderUnavailable(fromAnswer(500, 'api_error'))).toBe(true);
    expect(isProviderUnavailable(fromAnswer(503, 'api_error'))).toBe(true);
    expect(isProviderUnavailable(fromAnswer(429, 'rate_limit_error'))).toBe(true);
  });

  it('is false for a refusal of the request itself, and for anything not from the provider', () => {
    expect(isProviderUnavailable(fromAnswer(400, 'invalid_request_error'))).toBe(false);
    expect(isProviderUnavailable(fromAnswer(402, 'card_error'))).toBe(false);
    expect(isProviderUnavailable(fromAnswer(401, 'invalid_request_error'))).toBe(false);
    expect(isProviderUnavailable(new Error('boom'))).toBe(false);
  });
});
