import type { PayoutStatus } from './entities/payout.entity';

/**
 * What staff must do next about a payout: the Pay page groups its queue by this, and every total on the page (the
 * budget figures, the section counts, the approval dialogs) is summed from the same rows by `summarizePayTotals`.
 */
export const PAYOUT_STAGES = [
  'to-approve',
  'awaiting-setup',
  'needs-attention',
  'on-its-way',
  'paid',
  'closed',
] as const;
export type PayoutStage = (typeof PAYOUT_STAGES)[number];

/** Owed payouts split by whether the participant can receive money yet; the other stages follow the status. */
export function stageOf(status: PayoutStatus, payoutAccountReady: boolean): PayoutStage {
  switch (status) {
    case 'owed':
      return payoutAccountReady ? 'to-approve' : 'awaiting-setup';
    case 'failed':
      return 'needs-attention';
    case 'approved':
    case 'sending':
      return 'on-its-way';
    case 'paid':
      return 'paid';
    case 'cancelled':
    case 'reversed':
      return 'closed';
  }
}

/** The SQL condition for one stage, over `payout p` and `payout_account a` (left joined on the participant). */
export function stageCondition(stage: PayoutStage): string {
  const ready = 'coalesce(a.payouts_enabled, false)';
  switch (stage) {
    case 'to-approve':
      return `(p.status = 'owed' AND ${ready})`;
    case 'awaiting-setup':
      return `(p.status = 'owed' AND NOT ${ready})`;
    case 'needs-attention':
      return `p.status = 'failed'`;
    case 'on-its-way':
      return `p.status IN ('approved', 'sending')`;
    case 'paid':
      return `p.status = 'paid'`;
    case 'closed':
      return `p.status IN ('cancelled', 'reversed')`;
  }
}

/** One bucket of the ledger: a participant's payouts in one status, with whether they can receive money. */
export interface PayoutBucket {
  enrollmentId: string;
  status: PayoutStatus;
  payoutAccountReady: boolean;
  count: number;
  amountMinor: number;
}

export interface StageTotal {
  count: number;
  amountMinor: number;
  participants: number;
}

export interface PayTotals {
  countsByStatus: Partial<Record<PayoutStatus, number>>;
  amountByStatus: Partial<Record<PayoutStatus, number>>;
  stages: Record<PayoutStage, StageTotal>;
  /** The budget figures, from the same buckets. */
  owedMinor: number;
  needsAttentionMinor: number;
  committedMinor: number;
  paidMinor: number;
}

export function summarizePayTotals(buckets: PayoutBucket[]): PayTotals {
  const countsByStatus: Partial<Record<PayoutStatus, number>> = {};
  const amountByStatus: Partial<Record<PayoutStatus, number>> = {};
  const people = new Map<PayoutStage, Set<string>>(PAYOUT_STAGES.map((stage) => [stage, new Set()]));
  const stages = Object.fromEntries(
    PAYOUT_STAGES.map((stage) => [stage, { count: 0, amountMinor: 0, participants: 0 }]),
  ) as Record<PayoutStage, StageTotal>;
  for (const bucket of buckets) {
    countsByStatus[bucket.status] = (countsByStatus[bucket.status] ?? 0) + bucket.count;
    amountByStatus[bucket.status] = (amountByStatus[bucket.status] ?? 0) + bucket.amountMinor;
    const stage = stageOf(bucket.status, bucket.payoutAccountReady);
    stages[stage].count += bucket.count;
    stages[stage].amountMinor += bucket.amountMinor;
    people.get(stage)!.add(bucket.enrollmentId);
  }
  for (const stage of PAYOUT_STAGES) stages[stage].participants = people.get(stage)!.size;
  const amount = (status: PayoutStatus) => amountByStatus[status] ?? 0;
  return {
    countsByStatus,
    amountByStatus,
    stages,
    owedMinor: amount('owed'),
    needsAttentionMinor: amount('failed'),
    committedMinor: amount('approved') + amount('sending'),
    paidMinor: amount('paid'),
  };
}

/** Our receipt number: the study's slug and its paid payouts counted from 1, e.g. `harbor-memory-0007`. */
export function receiptNumber(studySlug: string, sequence: number): string {
  return `${studySlug}-${String(sequence).padStart(4, '0')}`;
}
