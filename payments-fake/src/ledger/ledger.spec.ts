import { describe, expect, it } from 'vitest';
import { ProviderError } from '../errors/provider-error';
import { Ledger } from './ledger';

describe('Ledger', () => {
  it('credits, debits and shows balances by currency with a zero default currency', () => {
    const ledger = new Ledger();
    ledger.creditAvailable('acct_p', 'usd', 10_000);
    ledger.debitAvailable('acct_p', 'usd', 2_500);
    ledger.creditAvailable('acct_p', 'eur', 300);
    expect(ledger.split('acct_p', 'usd')).toEqual({
      available: [
        { amount: 300, currency: 'eur' },
        { amount: 7_500, currency: 'usd' },
      ],
      pending: [
        { amount: 0, currency: 'eur' },
        { amount: 0, currency: 'usd' },
      ],
    });
    expect(ledger.split('acct_new', 'gbp')).toEqual({
      available: [{ amount: 0, currency: 'gbp' }],
      pending: [{ amount: 0, currency: 'gbp' }],
    });
  });

  it('refuses to go below zero with balance_insufficient and leaves the balance as it was', () => {
    const ledger = new Ledger();
    ledger.setAvailable('acct_p', 'usd', 999);
    try {
      ledger.debitAvailable('acct_p', 'usd', 1_000);
      throw new Error('expected an error');
    } catch (error) {
      expect((error as ProviderError).body.code).toBe('balance_insufficient');
    }
    expect(ledger.availableAmount('acct_p', 'usd')).toBe(999);
    ledger.debitAvailable('acct_p', 'usd', 999);
    expect(ledger.availableAmount('acct_p', 'usd')).toBe(0);
  });

  it('keeps pending funds out of available until their date', () => {
    const ledger = new Ledger();
    ledger.creditPending('acct_p', 'usd', 3_000, 1_000);
    ledger.creditPending('acct_p', 'usd', 500, 5_000);
    expect(ledger.pendingAmount('acct_p', 'usd')).toBe(3_500);
    expect(ledger.nextReleaseMs()).toBe(1_000);
    expect(ledger.releaseDue(999)).toEqual([]);
    expect(ledger.releaseDue(1_000)).toEqual([{ accountId: 'acct_p', currency: 'usd', amount: 3_000 }]);
    expect(ledger.availableAmount('acct_p', 'usd')).toBe(3_000);
    expect(ledger.pendingAmount('acct_p', 'usd')).toBe(500);
    ledger.releaseDue(Number.POSITIVE_INFINITY);
    expect(ledger.availableAmount('acct_p', 'usd')).toBe(3_500);
    expect(ledger.nextReleaseMs()).toBeUndefined();
  });

  it('takes only whole minor units', () => {
    const ledger = new Ledger();
    expect(() => ledger.creditAvailable('acct_p', 'usd', 10.5)).toThrow(RangeError);
  });
});

describe('Ledger snapshots', () => {
  it('gives back the same balances and pending funds, released at their saved time', () => {
    const ledger = new Ledger();
    ledger.creditAvailable('acct_p', 'usd', 7_500);
    ledger.creditAvailable('acct_c', 'eur', 300);
    ledger.creditPending('acct_p', 'usd', 2_000, 1_000_000);
    const copy = new Ledger();
    copy.restoreSnapshot(JSON.parse(JSON.stringify(ledger.toSnapshot())));
    expect(copy.toSnapshot()).toEqual(ledger.toSnapshot());
    expect(copy.split('acct_p', 'usd')).toEqual(ledger.split('acct_p', 'usd'));
    expect(copy.nextReleaseMs()).toBe(1_000_000);
    expect(copy.releaseDue(999_999)).toEqual([]);
    expect(copy.releaseDue(1_000_000)).toEqual([{ accountId: 'acct_p', currency: 'usd', amount: 2_000 }]);
    expect(copy.availableAmount('acct_p', 'usd')).toBe(9_500);
  });

  it('replaces what it held before', () => {
    const ledger = new Ledger();
    ledger.creditAvailable('acct_old', 'usd', 1);
    ledger.restoreSnapshot({ available: [], pending: [] });
    expect(ledger.availableAmount('acct_old', 'usd')).toBe(0);
  });
});
