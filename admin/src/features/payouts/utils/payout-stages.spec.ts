import { describe, expect, it } from 'vitest';
import { formatDay, payoutStages, summarizeSelection } from './payout-stages';

describe('summarizeSelection', () => {
  it('counts payouts, distinct participants and the sum', () => {
    expect(
      summarizeSelection([
        { enrollmentId: 'a', amountMinor: 1000 },
        { enrollmentId: 'a', amountMinor: 500 },
        { enrollmentId: 'b', amountMinor: 1200 },
      ]),
    ).toEqual({ payouts: 3, participants: 2, amountMinor: 2700 });
    expect(summarizeSelection([])).toEqual({ payouts: 0, participants: 0, amountMinor: 0 });
  });
});

describe('payoutStages', () => {
  it('covers each stage the api knows once', () => {
    expect(payoutStages.map((s) => s.stage).sort()).toEqual([
      'awaiting-setup',
      'closed',
      'needs-attention',
      'on-its-way',
      'paid',
      'to-approve',
    ]);
  });
});

describe('formatDay', () => {
  it('writes one date format throughout', () => {
    expect(formatDay('2026-12-04T15:00:00.000Z')).toBe('Dec 4, 2026');
    expect(formatDay(null)).toBe('—');
  });
});
