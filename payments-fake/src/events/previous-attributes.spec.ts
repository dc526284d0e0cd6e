import { describe, expect, it } from 'vitest';
import { eventTypeMatches } from '../resources/events';
import { previousAttributes } from './previous-attributes';

describe('previousAttributes', () => {
  it('gives the earlier values of changed fields only', () => {
    const before = { id: 'acct_1', email: null, metadata: { a: '1' }, payouts_enabled: false };
    const after = { id: 'acct_1', email: 'p001@evenhand.test', metadata: { a: '1' }, payouts_enabled: true };
    expect(previousAttributes(before, after)).toEqual({ email: null, payouts_enabled: false });
  });

  it('sees nested changes and new fields', () => {
    expect(previousAttributes({ metadata: { a: '1' } }, { metadata: { a: '2' }, description: 'x' })).toEqual({
      metadata: { a: '1' },
      description: null,
    });
  });
});

describe('eventTypeMatches', () => {
  // Wildcards as https://docs.stripe.com/api/events/list describes for `type`.
  it('matches exact types and trailing wildcards', () => {
    expect(eventTypeMatches('payout.paid', 'payout.paid')).toBe(true);
    expect(eventTypeMatches('payout.*', 'payout.paid')).toBe(true);
    expect(eventTypeMatches('payout.*', 'payment_intent.succeeded')).toBe(false);
    expect(eventTypeMatches('payout.paid', 'payout.failed')).toBe(false);
    expect(eventTypeMatches('*', 'account.updated')).toBe(true);
  });
});
