import { describe, expect, it } from 'vitest';
import { batchProgress } from './batch-progress';

// The states owed → approved → sending → paid | failed are the api's (payout.entity.ts, issue 5); the arithmetic is
// plain counting, checked by hand (common practice for a progress share: settled ÷ batch size).
describe('batchProgress', () => {
  it('counts what was paid or failed since the batch began and what is still being sent', () => {
    const progress = batchProgress(
      10,
      { owed: 12, paid: 3, failed: 1 },
      { owed: 2, approved: 2, sending: 1, paid: 8, failed: 3 },
    );
    expect(progress).toEqual({ inFlight: 3, paid: 5, failed: 2, settledShare: 0.7, finished: false });
  });

  it('is finished once nothing is approved or sending, even when every payout failed', () => {
    const progress = batchProgress(4, { owed: 4 }, { failed: 4 });
    expect(progress.finished).toBe(true);
    expect(progress.settledShare).toBe(1);
    expect(progress.failed).toBe(4);
  });

  it('never reports more than the whole batch, nor a negative count after a retry', () => {
    const progress = batchProgress(2, { failed: 5 }, { failed: 1, paid: 6 });
    expect(progress.failed).toBe(0);
    expect(progress.settledShare).toBe(1);
  });

  it('refuses a batch size that is not a whole number', () => {
    expect(() => batchProgress(-1, {}, {})).toThrow(/batchSize/);
    expect(() => batchProgress(1.5, {}, {})).toThrow(/batchSize/);
  });
});
