import Stripe from 'stripe';
import { describe, expect, it } from 'vitest';
import { computeSignature, signatureHeaderValue } from './webhook-signature';

// Outside reference: the official SDK (stripe 23.1.0), which implements
// https://docs.stripe.com/webhooks#verify-manually.
const stripe = new Stripe('sk_test_signature', { telemetry: false });
const secret = 'whsec_evenhand_test';
const payload = JSON.stringify(
  { id: 'evt_1', object: 'event', type: 'payout.paid', data: { object: { id: 'po_1' } } },
  null,
  2,
);

describe('webhook signature', () => {
  it('produces the same header as the SDK test helper for the same timestamp', () => {
    const timestamp = 1_750_000_000;
    const reference = stripe.webhooks.generateTestHeaderString({ payload, secret, timestamp });
    expect(signatureHeaderValue(payload, secret, timestamp)).toBe(reference);
  });

  it('is accepted by the SDK constructEvent', () => {
    const header = signatureHeaderValue(payload, secret, Math.floor(Date.now() / 1000));
    const event = stripe.webhooks.constructEvent(payload, header, secret);
    expect(event.id).toBe('evt_1');
  });

  it('is refused by constructEvent for another body, another secret or an old timestamp', () => {
    const now = Math.floor(Date.now() / 1000);
    const header = signatureHeaderValue(payload, secret, now);
    expect(() => stripe.webhooks.constructEvent(`${payload} `, header, secret)).toThrow();
    expect(() => stripe.webhooks.constructEvent(payload, header, 'whsec_other')).toThrow();
    // The SDK's default tolerance is 300 seconds.
    expect(() =>
      stripe.webhooks.constructEvent(payload, signatureHeaderValue(payload, secret, now - 301), secret),
    ).toThrow();
  });

  it('is the hex HMAC-SHA256 of "<t>.<body>"', () => {
    expect(computeSignature(payload, secret, 1)).toMatch(/^[0-9a-f]{64}$/);
    expect(computeSignature(payload, secret, 1)).not.toBe(computeSignature(payload, secret, 2));
  });
});
