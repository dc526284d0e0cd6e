import type { TestApp } from './test-app';

/** Day 0 of every invented history: far enough back that still-active participants have a long follow-up. */
export const HISTORY_START = Date.parse('2025-03-03T09:00:00Z');
const DAY_MS = 86_400_000;

/** A moment `day` whole days after HISTORY_START, plus an hour so that floor(days) is never on an edge. */
export function dayOf(day: number): Date {
  return new Date(HISTORY_START + day * DAY_MS + 3_600_000);
}

export interface HistoryEntry {
  conditionId?: string;
  status: 'invited' | 'screened' | 'excluded' | 'consented' | 'assigned' | 'active' | 'completed' | 'withdrew' | 'lost';
  /** Day the status was reached (completion, withdrawal, loss or exclusion); assignment is day 0 for the randomized. */
  endDay?: number;
  reason?: string | null;
  covariates?: Record<string, number | string | boolean>;
  stratumKey?: string;
  /** Payouts as [amount in minor units, payout status]. */
  payouts?: Array<[number, 'owed' | 'approved' | 'sending' | 'paid' | 'failed' | 'cancelled']>;
  /** How many of the study's steps this person completed (the first n). */
  stepsDone?: number;
}

/** Writes enrollments with a set history straight into the tables, as years of roster activity would have left them. */
export async function insertHistory(
  testApp: TestApp,
  studyId: string,
  entries: HistoryEntry[],
  tag: string,
): Promise<string[]> {
  const db = testApp.dataSource;
  const [{ currency }] = await db.query(`SELECT currency FROM study WHERE id = $1`, [studyId]);
  const steps: { id: string }[] = await db.query(`SELECT id FROM step WHERE study_id = $1 ORDER BY position`, [
    studyId,
  ]);
  const ids: string[] = [];
  for (const [i, entry] of entries.entries()) {
    const [user] = await db.query(`INSERT INTO user_account (email, role) VALUES ($1, 'participant') RETURNING id`, [
      `${tag}-${i}@example.test`,
    ]);
    const assigned = entry.conditionId !== undefined;
    const at = (status: string) => (entry.status === status ? dayOf(entry.endDay ?? 0) : null);
    const [enrollment] = await db.query(
      `INSERT INTO enrollment (study_id, participant_id, reference, status, covariates, stratum_key, condition_id,
                               invited_at, assigned_at, completed_at, withdrew_at, lost_at, excluded_at, exclusion_reason, withdrawal_reason, lost_reason)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14, $15, $16) RETURNING id`,
      [
        studyId,
        user.id,
        `${tag.toUpperCase()}-${String(i + 1).padStart(3, '0')}`,
        entry.status,
        JSON.stringify(entry.covariates ?? {}),
        entry.stratumKey ?? null,
        entry.conditionId ?? null,
        dayOf(-1),
        assigned ? dayOf(0) : null,
        at('completed'),
        at('withdrew'),
        at('lost'),
        at('excluded'),
        entry.status === 'excluded' ? (entry.reason ?? null) : null,
        entry.status === 'withdrew' ? (entry.reason ?? null) : null,
        entry.status === 'lost' ? (entry.reason ?? null) : null,
      ],
    );
    for (const step of steps.slice(0, entry.stepsDone ?? 0)) {
      await db.query(
        `INSERT INTO step_completion (enrollment_id, step_id, completed_at, verified_by) VALUES ($1, $2, $3, 'staff')`,
        [enrollment.id, step.id, dayOf(1)],
      );
    }
    for (const [j, [amount, status]] of (entry.payouts ?? []).entries()) {
      await db.query(
        `INSERT INTO payout (study_id, enrollment_id, participant_id, condition_id, kind, amount_minor, currency, status, idempotency_key, paid_at)
         VALUES ($1, $2, $3, $4, 'step', $5, $6, $7, $8, $9)`,
        [
          studyId,
          enrollment.id,
          user.id,
          entry.conditionId ?? null,
          amount,
          currency,
          status,
          `${tag}-${i}-${j}`,
          status === 'paid' ? dayOf(2) : null,
        ],
      );
    }
    ids.push(enrollment.id);
  }
  return ids;
}

const MAILBOX_URL = process.env.MAILBOX_URL ?? 'http://127.0.0.1:1080';

/** Every message in the local mailbox to this address whose subject matches. */
export async function mailsTo(address: string, subject: RegExp): Promise<Array<{ subject: string; text: string }>> {
  const response = await fetch(`${MAILBOX_URL}/api/email`);
  const messages = (await response.json()) as Array<{ subject: string; text: string; to: Array<{ address: string }> }>;
  return messages.filter(
    (m) => m.to.some((to) => to.address.toLowerCase() === address.toLowerCase()) && subject.test(m.subject),
  );
}

/** Waits until exactly `count` such messages have arrived, then a little longer to catch a surplus one. */
export async function expectMailCount(
  address: string,
  subject: RegExp,
  count: number,
  timeoutMs = 20_000,
): Promise<Array<{ subject: string; text: string }>> {
  const deadline = Date.now() + timeoutMs;
  let found = await mailsTo(address, subject);
  while (found.length < count && Date.now() < deadline) {
    await new Promise((resolve) => setTimeout(resolve, 250));
    found = await mailsTo(address, subject);
  }
  await new Promise((resolve) => setTimeout(resolve, 1500));
  found = await mailsTo(address, subject);
  if (found.length !== count)
    throw new Error(`Expected ${count} e-mail(s) to ${address} matching ${subject}, found ${found.length}`);
  return found;
}
