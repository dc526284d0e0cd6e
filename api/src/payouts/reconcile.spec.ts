import { describe, expect, it } from 'vitest';
import { reconcile } from './reconcile';

describe('reconcile', () => {
  it('finds nothing when every paid payout has its transfer', () => {
    const result = reconcile(
      [
        { id: 'p1', status: 'paid', amountMinor: 1000, transferId: 'tr_1' },
        { id: 'p2', status: 'owed', amountMinor: 500, transferId: null },
      ],
      [{ id: 'tr_1', amountMinor: 1000, reversed: false, payoutId: 'p1' }],
    );
    expect(result).toMatchObject({ differences: [], ledgerPaidMinor: 1000, providerTransferMinor: 1000 });
  });

  it('lists every kind of difference once', () => {
    const result = reconcile(
      [
        { id: 'p1', status: 'paid', amountMinor: 1000, transferId: 'tr_missing' },
        { id: 'p2', status: 'paid', amountMinor: 1200, transferId: 'tr_2' },
        { id: 'p3', status: 'paid', amountMinor: 800, transferId: 'tr_3' },
      ],
      [
        { id: 'tr_2', amountMinor: 1500, reversed: false, payoutId: 'p2' },
        { id: 'tr_3', amountMinor: 800, reversed: true, payoutId: 'p3' },
        { id: 'tr_stray', amountMinor: 300, reversed: false, payoutId: null },
      ],
    );
    expect(result.differences.map((d) => [d.kind, d.payoutId ?? d.transferId])).toEqual([
      ['missing-at-provider', 'p1'],
      ['amount-differs', 'p2'],
      ['reversal-differs', 'p3'],
      ['unknown-at-provider', 'tr_stray'],
    ]);
  });
});
