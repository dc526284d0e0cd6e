import type { Payout, PayoutStage } from '../api/get-payouts';
import { formatDay as formatDayInLocale } from '@/lib/dates';

/** The queue's groups, in the order staff work through them, each named by what happens next. */
export const payoutStages: ReadonlyArray<{ stage: PayoutStage; title: string; next: string }> = [
  {
    stage: 'to-approve',
    title: 'Waiting for approval',
    next: 'These participants can receive money. Check the rows, then approve to send.',
  },
  {
    stage: 'needs-attention',
    title: 'Needs attention',
    next: 'Sending failed. Read the reason, fix what it names, then send again.',
  },
  {
    stage: 'awaiting-setup',
    title: 'Waiting for the participant’s set-up',
    next: 'Nothing to approve yet. Each moves to “Waiting for approval” once the participant has set up how they get paid.',
  },
  {
    stage: 'on-its-way',
    title: 'Sent, on its way',
    next: 'Approved and being sent. Nothing to do; each settles as paid or needs attention.',
  },
  { stage: 'paid', title: 'Paid', next: 'Received. The participant was e-mailed a receipt with its receipt number.' },
  {
    stage: 'closed',
    title: 'Cancelled or sent back',
    next: 'No longer owed (a step undone), or returned by the bank and owed again as a new payout.',
  },
];

export interface SelectionSummary {
  payouts: number;
  participants: number;
  amountMinor: number;
}

/** How many payouts, to how many distinct participants, for how much: what an approval dialog states. */
export function summarizeSelection(rows: Pick<Payout, 'enrollmentId' | 'amountMinor'>[]): SelectionSummary {
  return {
    payouts: rows.length,
    participants: new Set(rows.map((row) => row.enrollmentId)).size,
    amountMinor: rows.reduce((sum, row) => sum + row.amountMinor, 0),
  };
}

export function plural(count: number, one: string, many: string): string {
  return `${count} ${count === 1 ? one : many}`;
}

/** Dates in the queue, in the staff app's one date format (e.g. Dec 4, 2026). */
export function formatDay(iso: string | null): string {
  return iso ? formatDayInLocale(iso) : '—';
}
