import { describe, expect, it } from 'vitest';
import { receiptNumber, stageOf, summarizePayTotals } from './pay-totals';

describe('summarizePayTotals', () => {
  const buckets = [
    { enrollmentId: 'a', status: 'owed' as const, payoutAccountReady: true, count: 3, amountMinor: 300 },
    { enrollmentId: 'b', status: 'owed' as const, payoutAccountReady: false, count: 2, amountMinor: 200 },
    { enrollmentId: 'c', status: 'owed' as const, payoutAccountReady: false, count: 1, amountMinor: 1000 },
    { enrollmentId: 'b', status: 'failed' as const, payoutAccountReady: false, count: 1, amountMinor: 1000 },
    { enrollmentId: 'a', status: 'paid' as const, payoutAccountReady: true, count: 1, amountMinor: 1000 },
    { enrollmentId: 'a', status: 'sending' as const, payoutAccountReady: true, count: 1, amountMinor: 50 },
    { enrollmentId: 'a', status: 'approved' as const, payoutAccountReady: true, count: 2, amountMinor: 70 },
  ];

  it('counts owed as the owed rows only; failed ones need attention and are counted apart', () => {
    const totals = summarizePayTotals(buckets);
    // The defect this guards: the owed card once added failed payouts while the queue's owed rows did not.
    expect(totals.owedMinor).toBe(1500);
    expect(totals.needsAttentionMinor).toBe(1000);
    expect(totals.committedMinor).toBe(120);
    expect(totals.paidMinor).toBe(1000);
    expect(totals.amountByStatus).toEqual({ owed: 1500, failed: 1000, paid: 1000, sending: 50, approved: 70 });
  });

  it('counts each stage and the distinct participants in it, so an approval dialog can say who is paid now and who waits', () => {
    const { stages } = summarizePayTotals(buckets);
    expect(stages['to-approve']).toEqual({ count: 3, amountMinor: 300, participants: 1 });
    expect(stages['awaiting-setup']).toEqual({ count: 3, amountMinor: 1200, participants: 2 });
    expect(stages['on-its-way']).toEqual({ count: 3, amountMinor: 120, participants: 1 });
    expect(stages.closed).toEqual({ count: 0, amountMinor: 0, participants: 0 });
  });

  it('places every status in exactly one stage', () => {
    expect(stageOf('owed', true)).toBe('to-approve');
    expect(stageOf('owed', false)).toBe('awaiting-setup');
    expect(stageOf('reversed', true)).toBe('closed');
    expect(stageOf('cancelled', false)).toBe('closed');
  });
});

describe('receiptNumber', () => {
  it('joins the study slug and a four-digit count', () => {
    expect(receiptNumber('harbor-memory', 7)).toBe('harbor-memory-0007');
    expect(receiptNumber('harbor-memory', 12345)).toBe('harbor-memory-12345');
  });
});
