import { describe, expect, it } from 'vitest';
import type { MyPayout } from '../api/get-my-payouts';
import { amountsInOrder, payoutTotals } from './payout-totals';

type Line = Pick<MyPayout, 'status' | 'amountMinor' | 'currency'>;
const line = (status: Line['status'], amountMinor: number, currency = 'USD'): Line => ({
  status,
  amountMinor,
  currency,
});

describe('what is owed, on its way and paid', () => {
  it('puts each status in its place and adds whole minor units', () => {
    const totals = payoutTotals([
      line('owed', 1000),
      line('owed', 1200),
      line('approved', 1500),
      line('sending', 500),
      line('failed', 250),
      line('paid', 1000),
      line('paid', 1250),
    ]);
    expect(totals).toEqual({ owed: { USD: 2200 }, onItsWay: { USD: 2250 }, paid: { USD: 2250 } });
  });

  it('leaves cancelled and returned payments out, since a returned one is owed again as a new payment', () => {
    const totals = payoutTotals([line('reversed', 1000), line('owed', 1000), line('cancelled', 700)]);
    expect(totals).toEqual({ owed: { USD: 1000 }, onItsWay: {}, paid: {} });
  });

  it('keeps currencies apart', () => {
    const totals = payoutTotals([line('paid', 1000, 'USD'), line('paid', 1500, 'EUR'), line('paid', 300, 'USD')]);
    expect(totals.paid).toEqual({ USD: 1300, EUR: 1500 });
    expect(amountsInOrder(totals.paid)).toEqual([
      { currency: 'EUR', minor: 1500 },
      { currency: 'USD', minor: 1300 },
    ]);
  });

  it('stays exact where floating-point dollars would drift', () => {
    // 0.1 + 0.2 !== 0.3 in IEEE 754 doubles (the classic example, e.g. https://0.30000000000000004.com); in cents it is 10 + 20 = 30.
    expect(0.1 + 0.2).not.toBe(0.3);
    expect(payoutTotals([line('paid', 10), line('paid', 20)]).paid).toEqual({ USD: 30 });
  });

  it('refuses an amount that is not whole minor units, naming the field', () => {
    expect(() => payoutTotals([line('owed', 12.5)])).toThrow(
      'amountMinor must be a whole number of minor units, got 12.5',
    );
  });
});
