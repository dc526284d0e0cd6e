import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { randomUUID } from 'node:crypto';
import { DataSource, EntityManager } from 'typeorm';
import { queryRows } from '../database/raw-query';
import { PayoutEntity } from './entities/payout.entity';
import { PayoutBucket, PayTotals, summarizePayTotals } from './pay-totals';
import { PayoutException } from './payout.exception';

export interface OwedPayoutInput {
  studyId: string;
  enrollmentId: string;
  participantId: string;
  conditionId: string | null;
  stepCompletionId: string | null;
  kind: 'step' | 'bonus';
  amountMinor: number;
  currency: string;
  payOverride: boolean;
}

/**
 * The payout ledger, the payouts domain's public service: what is owed per step completion, what a participant has
 * earned, and the study's totals and funded balance that approval, funding and the Pay page read.
 */
@Injectable()
export class PayoutsService {
  constructor(@InjectDataSource() private readonly dataSource: DataSource) {}

  /** Records money owed, in the caller's transaction; the same completion never owes twice. */
  async createOwed(manager: EntityManager, input: OwedPayoutInput): Promise<PayoutEntity | null> {
    const id = randomUUID();
    const rows = await queryRows<{ id: string }>(
      manager,
      `INSERT INTO payout (id, study_id, enrollment_id, participant_id, condition_id, step_completion_id, kind, amount_minor, currency, pay_override, idempotency_key)
       VALUES ($1::uuid, $2, $3, $4, $5, $6, $7, $8, $9, $10, $1::text) ON CONFLICT DO NOTHING RETURNING id`,
      [
        id,
        input.studyId,
        input.enrollmentId,
        input.participantId,
        input.conditionId,
        input.stepCompletionId,
        input.kind,
        input.amountMinor,
        input.currency,
        input.payOverride,
      ],
    );
    return rows.length ? manager.findOneOrFail(PayoutEntity, { where: { id } }) : null;
  }

  /**
   * Cancels what a step completion (and, with `bonus`, the completion bonus) made owed, so the completion can be
   * undone. Refused once any of it was approved: approved pay is on its way to the participant.
   */
  async cancelOwedFor(
    manager: EntityManager,
    input: { enrollmentId: string; stepCompletionId: string; bonus: boolean },
  ): Promise<number> {
    const rows: Array<{ id: string; status: string; kind: string }> = await manager.query(
      `SELECT id, status, kind FROM payout
        WHERE status NOT IN ('cancelled','reversed')
          AND (step_completion_id = $1 OR ($3 AND enrollment_id = $2 AND kind = 'bonus'))
        FOR UPDATE`,
      [input.stepCompletionId, input.enrollmentId, input.bonus],
    );
    if (rows.some((row) => row.status !== 'owed')) {
      throw new PayoutException(
        'PAYOUT_ALREADY_APPROVED',
        'Its payout has already been approved, so this completion can no longer be undone.',
        [{ field: 'stepId', message: 'payout already approved' }],
      );
    }
    if (rows.length === 0) return 0;
    await manager.query(`UPDATE payout SET status = 'cancelled', updated_at = now() WHERE id = ANY($1::uuid[])`, [
      rows.map((r) => r.id),
    ]);
    return rows.length;
  }

  /** Payout status per step completion, for the participant's record. */
  async statusByCompletion(completionIds: string[]): Promise<Map<string, string>> {
    if (completionIds.length === 0) return new Map();
    const rows: Array<{ step_completion_id: string; status: string }> = await this.dataSource.query(
      `SELECT DISTINCT ON (step_completion_id) step_completion_id, status FROM payout WHERE step_completion_id = ANY($1::uuid[])
        ORDER BY step_completion_id, (status IN ('cancelled','reversed')), created_at DESC`,
      [completionIds],
    );
    return new Map(rows.map((r) => [r.step_completion_id, r.status]));
  }

  async earnedFor(enrollmentId: string, manager: EntityManager = this.dataSource.manager) {
    const [row] = await manager.query(
      `SELECT coalesce(sum(amount_minor) FILTER (WHERE status NOT IN ('cancelled','reversed')), 0) AS earned,
              coalesce(sum(amount_minor) FILTER (WHERE status = 'paid'), 0) AS paid
       FROM payout WHERE enrollment_id = $1`,
      [enrollmentId],
    );
    const earnedMinor = Number(row.earned);
    const paidMinor = Number(row.paid);
    return { earnedMinor, paidMinor, stillToBePaidMinor: earnedMinor - paidMinor };
  }

  /** Every total the Pay page shows, from one pass over the study's payouts (see pay-totals.ts). */
  async payTotals(manager: EntityManager, studyId: string): Promise<PayTotals> {
    const rows: Array<{
      enrollment_id: string;
      status: PayoutEntity['status'];
      ready: boolean;
      n: string;
      amount: string;
    }> = await manager.query(
      `SELECT p.enrollment_id, p.status, coalesce(a.payouts_enabled, false) AS ready, count(*) AS n, sum(p.amount_minor) AS amount
       FROM payout p LEFT JOIN payout_account a ON a.user_id = p.participant_id
       WHERE p.study_id = $1 GROUP BY 1, 2, 3`,
      [studyId],
    );
    const buckets: PayoutBucket[] = rows.map((r) => ({
      enrollmentId: r.enrollment_id,
      status: r.status,
      payoutAccountReady: r.ready,
      count: Number(r.n),
      amountMinor: Number(r.amount),
    }));
    return summarizePayTotals(buckets);
  }

  /** Funded, committed, paid and owed money of a study, and what is left to approve. */
  async balance(manager: EntityManager, studyId: string) {
    const [funded] = await manager.query(
      `SELECT coalesce(sum(amount_minor), 0) AS n FROM study_funding WHERE study_id = $1 AND status = 'succeeded'`,
      [studyId],
    );
    const { committedMinor, paidMinor, owedMinor, needsAttentionMinor } = await this.payTotals(manager, studyId);
    const fundedMinor = Number(funded.n);
    return {
      fundedMinor,
      committedMinor,
      paidMinor,
      owedMinor,
      needsAttentionMinor,
      remainingMinor: fundedMinor - committedMinor - paidMinor,
    };
  }
}
