/** Payouts counted by status, as the queue reports them (`countsByStatus`). */
export type StatusCounts = Partial<Record<string, number>>;

export interface BatchProgress {
  /** Approved or being sent: not settled yet. */
  inFlight: number;
  paid: number;
  failed: number;
  /** Paid or failed out of the batch, 0–1. */
  settledShare: number;
  finished: boolean;
}

const count = (counts: StatusCounts, status: string) => counts[status] ?? 0;

/**
 * How far a batch of approvals has got, from the study's counts before the batch and now. A payout settles as paid or
 * failed; what is still approved or sending is in flight. Counts are floored at zero because staff may retry or
 * approve other payouts while a batch runs.
 */
export function batchProgress(batchSize: number, before: StatusCounts, now: StatusCounts): BatchProgress {
  if (!Number.isInteger(batchSize) || batchSize < 0)
    throw new RangeError(`batchSize must be a whole number of payouts, got ${batchSize}`);
  const inFlight = count(now, 'approved') + count(now, 'sending');
  const paid = Math.max(0, count(now, 'paid') - count(before, 'paid'));
  const failed = Math.max(0, count(now, 'failed') - count(before, 'failed'));
  const settled = Math.min(batchSize, paid + failed);
  return { inFlight, paid, failed, settledShare: batchSize === 0 ? 1 : settled / batchSize, finished: inFlight === 0 };
}
