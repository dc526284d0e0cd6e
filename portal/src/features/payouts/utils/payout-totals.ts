import type { MyPayout, PayoutStatus } from '../api/get-my-payouts';

/** The three amounts a participant follows; a cancelled or returned payment counts in none of them. */
export type PayoutBucket = 'owed' | 'onItsWay' | 'paid';

/**
 * Where each status counts. A failed payment is still on its way: the research team sends it again. A returned
 * (reversed) one is owed again as a new payment, so counting the old one too would count it twice.
 */
export const bucketOfStatus: Record<PayoutStatus, PayoutBucket | null> = {
  owed: 'owed',
  approved: 'onItsWay',
  sending: 'onItsWay',
  failed: 'onItsWay',
  paid: 'paid',
  cancelled: null,
  reversed: null,
};

/** Minor units per currency code, e.g. { USD: 2200 }. */
export type AmountsByCurrency = Record<string, number>;

export type PayoutTotals = Record<PayoutBucket, AmountsByCurrency>;

/** Adds the payments up per bucket and currency, in whole minor units (never mixing currencies). */
export function payoutTotals(items: Pick<MyPayout, 'status' | 'amountMinor' | 'currency'>[]): PayoutTotals {
  const totals: PayoutTotals = { owed: {}, onItsWay: {}, paid: {} };
  for (const item of items) {
    if (!Number.isSafeInteger(item.amountMinor)) {
      throw new RangeError(`amountMinor must be a whole number of minor units, got ${item.amountMinor}`);
    }
    const bucket = bucketOfStatus[item.status];
    if (!bucket) continue;
    const amounts = totals[bucket];
    amounts[item.currency] = (amounts[item.currency] ?? 0) + item.amountMinor;
  }
  return totals;
}

/** The currencies with an amount, in a fixed order (alphabetical), each with its amount; zero amounts are kept. */
export function amountsInOrder(amounts: AmountsByCurrency): { currency: string; minor: number }[] {
  return Object.keys(amounts)
    .sort()
    .map((currency) => ({ currency, minor: amounts[currency] ?? 0 }));
}
