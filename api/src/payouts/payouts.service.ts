import { Injectable, Logger, OnModuleInit } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { randomUUID } from 'node:crypto';
import Stripe from 'stripe';
import { DataSource, EntityManager, In } from 'typeorm';
import { AuditActor, AuditService } from '../audit';
import type { SessionUser } from '../common/auth/session-user';
import { DomainException } from '../common/errors/domain.exception';
import { AppConfig } from '../config/app-config';
import { formatMoney } from '../consent';
import { queryRows } from '../database/raw-query';
import { JOB_NAMES, JOB_RETRY_LIMIT, JobQueueService } from '../jobs/job-queue.service';
import { MailService } from '../mail/mail.service';
import { PaymentsService } from '../payments/payments.service';
import { StudiesService } from '../studies';
import { UsersService } from '../users';
import {
  ApprovalResultDto,
  BudgetDto,
  FinanceExportQueryDto,
  FundingIntentDto,
  MyPayoutsDto,
  OnboardingLinkDto,
  PayoutAccountStatusDto,
  PayoutPageDto,
  PayoutQueryDto,
  ReconciliationDto,
  TaxThresholdDto,
} from './dto/payout.dto';
import { PayoutAccountEntity } from './entities/payout-account.entity';
import { PayoutEntity } from './entities/payout.entity';
import { StudyFundingEntity } from './entities/study-funding.entity';
import { APPLIED_EVENT_TYPES, ProviderEventEnvelope, readProviderEvent, signatureTimeProblem } from './provider-event';
import { reconcile } from './reconcile';
import { financeExportCsv, financeExportFileName, thresholdStanding } from './finance-export';
import { PayoutBucket, PayTotals, receiptNumber, stageCondition, stageOf, summarizePayTotals } from './pay-totals';

export const TAX_CAUTION =
  'Tax reporting rules differ by country and institution. This threshold is a screening aid: follow your institution’s finance office.';
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
const SORT_ORDER = {
  newest: 'p.created_at DESC, p.id',
  oldest: 'p.created_at ASC, p.id',
  'amount-desc': 'p.amount_minor DESC, p.created_at DESC, p.id',
  'amount-asc': 'p.amount_minor ASC, p.created_at DESC, p.id',
  participant: 'e.reference ASC, p.created_at DESC, p.id',
} as const;

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

/** A send attempt that must not be retried as is: the provider refused it for a reason a person has to fix. */
function isFinalRefusal(error: unknown): error is Stripe.errors.StripeError {
  if (!(error instanceof Stripe.errors.StripeError)) return false;
  const status = error.statusCode ?? 0;
  return status >= 400 && status < 500 && status !== 409 && status !== 429;
}

@Injectable()
export class PayoutsService implements OnModuleInit {
  private readonly logger = new Logger('Payouts');
  /** Test hook: runs after the provider created a transfer and before we record it, to play a crash there. */
  afterTransferCreated: ((payoutId: string) => void) | null = null;

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly config: AppConfig,
    private readonly audit: AuditService,
    private readonly jobs: JobQueueService,
    private readonly mail: MailService,
    private readonly payments: PaymentsService,
    private readonly studies: StudiesService,
    private readonly users: UsersService,
  ) {}

  async onModuleInit(): Promise<void> {
    await this.jobs.handle<{ payoutId: string }>(JOB_NAMES.sendPayout, ({ payoutId }) => this.send(payoutId), {
      onGiveUp: ({ payoutId }, reason) => this.giveUp(payoutId, reason),
    });
    await this.jobs.handle<{ payoutId: string }>(JOB_NAMES.payoutReceipt, ({ payoutId }) => this.sendReceipt(payoutId));
  }

  private get provider(): Stripe {
    return this.payments.client;
  }

  // ── what is owed ──────────────────────────────────────────────────────────

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
      throw new DomainException(
        'CONFLICT',
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

  // ── the queue ─────────────────────────────────────────────────────────────

  async list(studyId: string, query: PayoutQueryDto): Promise<PayoutPageDto> {
    await this.studies.require(studyId);
    const labels = new Map((await this.studies.listConditions(studyId)).map((c) => [c.id, c.internalName ?? c.code]));
    const where: string[] = ['p.study_id = $1'];
    const params: unknown[] = [studyId];
    if (query.status) where.push(`p.status = $${params.push(query.status)}`);
    if (query.stage) where.push(stageCondition(query.stage));
    if (query.conditionId) where.push(`p.condition_id = $${params.push(query.conditionId)}`);
    if (query.enrollmentId) where.push(`p.enrollment_id = $${params.push(query.enrollmentId)}`);
    const search = query.search?.trim();
    if (search) {
      const n = params.push(`%${search.replace(/[\\%_]/g, (c) => `\\${c}`)}%`);
      where.push(`(e.reference ILIKE $${n} OR s.title ILIKE $${n} OR p.receipt_number ILIKE $${n})`);
    }
    const from = `FROM payout p
       JOIN enrollment e ON e.id = p.enrollment_id
       LEFT JOIN step_completion c ON c.id = p.step_completion_id
       LEFT JOIN step s ON s.id = c.step_id
       LEFT JOIN payout_account a ON a.user_id = p.participant_id
       WHERE ${where.join(' AND ')}`;
    const [{ total }] = await this.dataSource.query(`SELECT count(*) AS total ${from}`, params);
    const rows: Array<Record<string, unknown>> = await this.dataSource.query(
      `SELECT p.*, e.reference, s.title AS step_title, coalesce(a.payouts_enabled, false) AS account_ready ${from}
       ORDER BY ${SORT_ORDER[query.sort ?? 'newest']} LIMIT ${query.pageSize} OFFSET ${(query.page - 1) * query.pageSize}`,
      params,
    );
    const totals = await this.payTotals(this.dataSource.manager, studyId);
    return {
      items: rows.map((r) => ({
        id: r.id as string,
        enrollmentId: r.enrollment_id as string,
        reference: r.reference as string,
        condition: r.condition_id ? (labels.get(r.condition_id as string) ?? null) : null,
        kind: r.kind as 'step' | 'bonus',
        stepTitle: (r.step_title as string | null) ?? null,
        amountMinor: Number(r.amount_minor),
        currency: (r.currency as string).trim(),
        payOverride: r.pay_override as boolean,
        status: r.status as PayoutEntity['status'],
        stage: stageOf(r.status as PayoutEntity['status'], r.account_ready as boolean),
        failureReason: (r.failure_reason as string | null) ?? null,
        receiptNumber: (r.receipt_number as string | null) ?? null,
        providerTransferId: (r.provider_transfer_id as string | null) ?? null,
        payoutAccountReady: r.account_ready as boolean,
        createdAt: (r.created_at as Date).toISOString(),
        approvedAt: r.approved_at ? (r.approved_at as Date).toISOString() : null,
        paidAt: r.paid_at ? (r.paid_at as Date).toISOString() : null,
      })),
      total: Number(total),
      page: query.page,
      pageSize: query.pageSize,
      countsByStatus: totals.countsByStatus,
      amountByStatus: totals.amountByStatus,
      stages: totals.stages,
    };
  }

  /** Every total the Pay page shows, from one pass over the study's payouts (see pay-totals.ts). */
  private async payTotals(manager: EntityManager, studyId: string): Promise<PayTotals> {
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

  private async balance(manager: EntityManager, studyId: string) {
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

  /** Approves owed payouts and queues one send job each; refused beyond the study's funded balance. */
  async approve(actor: AuditActor, studyId: string, payoutIds: string[]): Promise<ApprovalResultDto> {
    return this.dataSource.transaction(async (manager) => {
      // One approval at a time per study, so two batches cannot both pass the budget check.
      await this.studies.require(studyId, manager, true);
      const unique = [...new Set(payoutIds)];
      const payouts = await manager.find(PayoutEntity, {
        where: { id: In(unique), studyId },
        lock: { mode: 'pessimistic_write' },
      });
      const missing = unique.filter((id) => !payouts.some((p) => p.id === id));
      if (missing.length)
        throw new DomainException(
          'NOT_FOUND',
          `${missing.length} payout(s) are not in this study.`,
          missing.map((id) => ({ field: 'payoutIds', message: `${id} is not a payout of this study` })),
        );
      const notOwed = payouts.filter((p) => p.status !== 'owed');
      if (notOwed.length) {
        throw new DomainException(
          'CONFLICT',
          'Only owed payouts can be approved.',
          notOwed.map((p) => ({ field: 'payoutIds', message: `${p.id} is ${p.status}` })),
        );
      }
      const amountMinor = payouts.reduce((sum, p) => sum + p.amountMinor, 0);
      const { remainingMinor } = await this.balance(manager, studyId);
      if (amountMinor > remainingMinor) {
        throw new DomainException(
          'CONFLICT',
          `Approving ${payouts.length} payout(s) needs more than the study's funded balance. Fund the study first.`,
          undefined,
          {
            neededMinor: amountMinor,
            remainingMinor,
          },
        );
      }
      const now = new Date();
      await manager.update(
        PayoutEntity,
        { id: In(unique) },
        { status: 'approved', approvedBy: actor.id, approvedAt: now, failureReason: null },
      );
      await this.jobs.enqueueMany(
        manager,
        JOB_NAMES.sendPayout,
        payouts.map((payout) => ({ payoutId: payout.id })),
      );
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'payout.approved',
        subjectType: 'study',
        subjectId: studyId,
        data: { count: payouts.length, amountMinor, payoutIds: unique },
      });
      return { approved: payouts.length, amountMinor, remainingMinor: remainingMinor - amountMinor };
    });
  }

  /** Sends a failed payout again; only staff of its study (or an admin) may, and to anyone else it does not exist. */
  async retry(actor: SessionUser, payoutId: string): Promise<{ studyId: string }> {
    return this.dataSource.transaction(async (manager) => {
      const payout = await manager.findOne(PayoutEntity, {
        where: { id: payoutId },
        lock: { mode: 'pessimistic_write' },
      });
      if (!payout || (actor.role !== 'admin' && !(await this.studies.isMember(actor.id, payout.studyId)))) {
        throw new DomainException('NOT_FOUND', 'No such payout.');
      }
      if (payout.status !== 'failed')
        throw new DomainException(
          'PAYOUT_NOT_RETRYABLE',
          `Only failed payouts can be retried; this one is ${payout.status}.`,
        );
      const { remainingMinor } = await this.balance(manager, payout.studyId);
      if (payout.amountMinor > remainingMinor)
        throw new DomainException(
          'CONFLICT',
          "The study's funded balance does not cover this payout. Fund the study first.",
        );
      await manager.update(
        PayoutEntity,
        { id: payoutId },
        { status: 'approved', approvedBy: actor.id, approvedAt: new Date() },
      );
      await this.jobs.enqueue(manager, JOB_NAMES.sendPayout, { payoutId });
      await this.audit.record(manager, {
        chain: payout.studyId,
        actor,
        action: 'payout.retried',
        subjectType: 'payout',
        subjectId: payoutId,
        data: { previousReason: payout.failureReason },
      });
      return { studyId: payout.studyId };
    });
  }

  /**
   * Sends one approved payout. The transfer's Idempotency-Key is the payout's own key, so however often this runs
   * (a retry after a timeout, a crash between sending and recording) the provider makes one transfer.
   */
  async send(payoutId: string): Promise<void> {
    // Claims the payout and reads where it goes in one statement: the row lock lasts only that statement, and a
    // payout that is no longer approved (paid meanwhile, cancelled) is left alone.
    const [payout] = await queryRows<{
      id: string;
      study_id: string;
      amount_minor: string;
      currency: string;
      idempotency_key: string;
      provider_account_id: string | null;
      payouts_enabled: boolean | null;
    }>(
      this.dataSource.manager,
      `WITH claimed AS (
         UPDATE payout SET status = 'sending', attempts = attempts + 1, sent_at = coalesce(sent_at, now()), updated_at = now()
         WHERE id = $1 AND status IN ('approved', 'sending')
         RETURNING id, study_id, participant_id, amount_minor, currency, idempotency_key
       )
       SELECT claimed.*, a.provider_account_id, a.payouts_enabled FROM claimed LEFT JOIN payout_account a ON a.user_id = claimed.participant_id`,
      [payoutId],
    );
    if (!payout) return;
    const claimed = { id: payout.id, studyId: payout.study_id };
    if (!payout.payouts_enabled || !payout.provider_account_id) {
      await this.markFailed(claimed, 'The participant has not finished setting up how they get paid.');
      return;
    }
    let transfer: Stripe.Transfer;
    try {
      transfer = await this.provider.transfers.create(
        {
          amount: Number(payout.amount_minor),
          currency: payout.currency.trim().toLowerCase(),
          destination: payout.provider_account_id,
          transfer_group: `study_${payout.study_id}`,
          metadata: { payoutId: payout.id, studyId: payout.study_id },
        },
        { idempotencyKey: payout.idempotency_key },
      );
    } catch (error) {
      if (isFinalRefusal(error)) {
        await this.markFailed(claimed, error.message);
        return;
      }
      throw error; // a timeout, a 5xx or a rate limit: the job retries with the same key
    }
    this.afterTransferCreated?.(payout.id);
    await this.markPaid(payout.id, transfer.id);
  }

  /**
   * Ends a payout that is on its way as failed, with the reason: its amount leaves the committed budget and staff
   * may retry it (the retry sends under the same Idempotency-Key, so it can never pay twice). With `idleSince`,
   * only a payout no try has touched since then (the sweeper's guard against a sender that just woke up).
   */
  async markFailed(
    payout: { id: string; studyId: string },
    reason: string,
    options: { from?: Array<'approved' | 'sending'>; idleSince?: Date } = {},
  ): Promise<boolean> {
    return this.dataSource.transaction(async (manager) => {
      const [failed] = await queryRows<{ id: string }>(
        manager,
        `UPDATE payout SET status = 'failed', failure_reason = $2, updated_at = now()
         WHERE id = $1 AND status = ANY($3::text[]) AND ($4::timestamptz IS NULL OR updated_at < $4) RETURNING id`,
        [payout.id, reason, options.from ?? ['sending'], options.idleSince ?? null],
      );
      if (failed) {
        await this.audit.record(manager, {
          chain: payout.studyId,
          actor: null,
          action: 'payout.undelivered',
          subjectType: 'payout',
          subjectId: payout.id,
          data: { reason },
        });
      }
      return Boolean(failed);
    });
  }

  /** The send job's last try failed: the payout ends failed and retryable instead of staying `sending`. */
  private async giveUp(payoutId: string, lastFailure: string): Promise<void> {
    const payout = await this.dataSource.getRepository(PayoutEntity).findOne({ where: { id: payoutId } });
    if (!payout) return;
    const reason = `All ${JOB_RETRY_LIMIT + 1} tries to send it failed; the payment provider did not take it (last: ${lastFailure}). Retry it to send it again.`;
    await this.markFailed(payout, reason, { from: ['approved', 'sending'] });
  }

  /**
   * Records what a transfer at the provider says about its payout (its metadata names it): the payout is paid by
   * that transfer, and reversed when the transfer was. Used by webhooks and by the sweeper; applying the same
   * transfer again changes nothing.
   */
  async settleFromTransfer(
    transfer: Pick<Stripe.Transfer, 'id' | 'reversed' | 'metadata'>,
    manager?: EntityManager,
  ): Promise<void> {
    const run = async (m: EntityManager) => {
      const payoutId = transfer.metadata?.payoutId;
      if (payoutId && UUID.test(payoutId)) await this.markPaid(payoutId, transfer.id, m);
      if (transfer.reversed) await this.applyReversal(m, transfer.id);
    };
    if (manager) await run(manager);
    else await this.dataSource.transaction(run);
  }

  /**
   * Marks a payout paid once; called by the sender, by transfer webhooks and by the sweeper, whichever comes first.
   * A failed payout is marked paid too: a transfer that exists is the truth, whatever we had concluded without it.
   */
  private async markPaid(payoutId: string, transferId: string, manager?: EntityManager): Promise<void> {
    const run = async (m: EntityManager) => {
      const [payout] = await queryRows<{ study_id: string; amount_minor: string }>(
        m,
        `UPDATE payout SET status = 'paid', provider_transfer_id = $2, paid_at = now(), failure_reason = NULL, updated_at = now()
         WHERE id = $1 AND status IN ('approved', 'sending', 'failed') RETURNING study_id, amount_minor`,
        [payoutId, transferId],
      );
      if (!payout) return;
      // Numbered only once paid, under the counter row's lock, so a study's receipts count 1, 2, 3… without gaps.
      const [counter] = await queryRows<{ last_number: number; slug: string }>(
        m,
        `WITH next AS (
           INSERT INTO payout_receipt_counter (study_id, last_number) VALUES ($1, 1)
           ON CONFLICT (study_id) DO UPDATE SET last_number = payout_receipt_counter.last_number + 1 RETURNING last_number
         ) SELECT next.last_number, s.slug FROM next, study s WHERE s.id = $1`,
        [payout.study_id],
      );
      await m.query(`UPDATE payout SET receipt_number = $2 WHERE id = $1`, [
        payoutId,
        receiptNumber(counter.slug, counter.last_number),
      ]);
      await this.jobs.enqueue(m, JOB_NAMES.payoutReceipt, { payoutId });
      await this.audit.record(m, {
        chain: payout.study_id,
        actor: null,
        action: 'payout.delivered',
        subjectType: 'payout',
        subjectId: payoutId,
        data: { transferId, amountMinor: Number(payout.amount_minor) },
      });
    };
    if (manager) await run(manager);
    else await this.dataSource.transaction(run);
  }

  private async sendReceipt(payoutId: string): Promise<void> {
    const payout = await this.dataSource.getRepository(PayoutEntity).findOne({ where: { id: payoutId } });
    if (!payout || payout.status !== 'paid' || payout.receiptSentAt) return;
    const study = await this.studies.require(payout.studyId);
    const participant = await this.users.findActiveById(payout.participantId);
    if (participant) {
      const amount = formatMoney(payout.amountMinor, payout.currency.trim());
      await this.mail.deliver({
        to: participant.email,
        subject: `Receipt: ${amount} for "${study.title}"`,
        text: [
          'Hello,',
          '',
          `We have sent you ${amount} for taking part in "${study.title}".`,
          `Receipt number: ${payout.receiptNumber}`,
          `Sent on: ${payout.paidAt?.toISOString().slice(0, 10)}`,
          '',
          'It can take a few working days to reach your bank account. You can see all your payments in the study portal.',
          'Payments for research can count as income. Rules differ by country; if you are unsure, ask a tax adviser.',
          '',
          `${study.labName || 'The research team'}`,
        ].join('\n'),
      });
    }
    await this.dataSource.getRepository(PayoutEntity).update({ id: payoutId }, { receiptSentAt: new Date() });
  }

  // ── provider events ───────────────────────────────────────────────────────

  /**
   * Verifies and applies one webhook. A bad signature, or one stamped more than five minutes from our clock either
   * way, changes nothing; so does a malformed event (400 naming the field), an event seen before, and an event older
   * than the last one applied to the same object (the provider does not promise delivery order, and each event
   * carries its object's whole state at that moment, so applying a stale one would undo a newer state).
   */
  async handleWebhook(
    rawBody: Buffer | undefined,
    signature: string | undefined,
  ): Promise<{ received: true; duplicate: boolean }> {
    if (!rawBody || !signature) {
      throw new DomainException('VALIDATION_FAILED', 'A signed webhook body is required.', [
        { field: 'Stripe-Signature', message: 'is missing' },
      ]);
    }
    let body: unknown;
    try {
      body = this.provider.webhooks.constructEvent(rawBody, signature, this.config.stripeWebhookSecret, 300);
    } catch (error) {
      if (error instanceof SyntaxError) {
        throw new DomainException('VALIDATION_FAILED', 'The webhook body is not JSON.', [
          { field: 'body', message: 'must be a JSON event' },
        ]);
      }
      throw new DomainException('VALIDATION_FAILED', 'The webhook signature does not verify.', [
        { field: 'Stripe-Signature', message: (error as Error).message },
      ]);
    }
    const timeProblem = signatureTimeProblem(signature, Math.floor(Date.now() / 1000));
    if (timeProblem) {
      throw new DomainException('VALIDATION_FAILED', 'The webhook signature is stamped outside the accepted window.', [
        { field: 'Stripe-Signature', message: timeProblem },
      ]);
    }
    const read = readProviderEvent(body);
    if ('errors' in read)
      throw new DomainException('VALIDATION_FAILED', 'The webhook event is malformed.', read.errors);
    const { event } = read;
    return this.dataSource.transaction(async (manager) => {
      const inserted = await queryRows(
        manager,
        // Stored as processed: it is applied in this same transaction, so either both happen or neither.
        `INSERT INTO provider_event (provider_event_id, type, created_at_provider, payload, processed_at, object_id) VALUES ($1, $2, to_timestamp($3), $4, now(), $5)
         ON CONFLICT (provider_event_id) DO NOTHING RETURNING id`,
        [event.id, event.type, event.created, JSON.stringify(body), event.objectId],
      );
      if (inserted.length === 0) return { received: true as const, duplicate: true };
      if (APPLIED_EVENT_TYPES.has(event.type)) {
        if (await this.isNewestFor(manager, event)) await this.apply(manager, event);
        else await manager.query(`UPDATE provider_event SET applied = false WHERE provider_event_id = $1`, [event.id]);
      }
      return { received: true as const, duplicate: false };
    });
  }

  /**
   * Records this event as the newest applied to its object unless a newer one already was. The row stays locked
   * until the transaction ends, so two events about one object are applied one after the other; a tie (the same
   * second) is applied in arrival order.
   */
  private async isNewestFor(manager: EntityManager, event: ProviderEventEnvelope): Promise<boolean> {
    const rows = await queryRows(
      manager,
      `INSERT INTO provider_object_version (object_id, object_type, last_event_id, last_event_created_at) VALUES ($1, $2, $3, to_timestamp($4))
       ON CONFLICT (object_id) DO UPDATE SET last_event_id = excluded.last_event_id, last_event_created_at = excluded.last_event_created_at, updated_at = now()
         WHERE provider_object_version.last_event_created_at <= excluded.last_event_created_at
       RETURNING object_id`,
      [event.objectId, String(event.object.object ?? event.type.split('.')[0]), event.id, event.created],
    );
    return rows.length > 0;
  }

  private async apply(manager: EntityManager, event: ProviderEventEnvelope): Promise<void> {
    switch (event.type) {
      case 'account.updated':
        await this.updateAccountState(manager, event.object as unknown as Stripe.Account);
        return;
      case 'transfer.created':
      case 'transfer.updated':
      case 'transfer.reversed':
        await this.settleFromTransfer(event.object as unknown as Stripe.Transfer, manager);
        return;
      case 'payment_intent.succeeded':
      case 'payment_intent.payment_failed':
        await this.applyFunding(
          manager,
          event.objectId!,
          event.type === 'payment_intent.succeeded' ? 'succeeded' : 'failed',
        );
        return;
      default:
        return;
    }
  }

  private async updateAccountState(manager: EntityManager, account: Stripe.Account): Promise<void> {
    const enabled = Boolean(account.payouts_enabled) && account.capabilities?.transfers === 'active';
    await manager.update(
      PayoutAccountEntity,
      { providerAccountId: account.id },
      { payoutsEnabled: enabled, onboardingState: account.details_submitted ? 'complete' : 'started' },
    );
  }

  /** A reversed transfer: the payout is marked reversed and the money is owed again as a new payout. */
  private async applyReversal(manager: EntityManager, transferId: string): Promise<void> {
    const payout = await manager.findOne(PayoutEntity, {
      where: { providerTransferId: transferId },
      lock: { mode: 'pessimistic_write' },
    });
    if (!payout || payout.status === 'reversed') return;
    await manager.update(PayoutEntity, { id: payout.id }, { status: 'reversed', reversedAt: new Date() });
    const again = await this.createOwed(manager, {
      studyId: payout.studyId,
      enrollmentId: payout.enrollmentId,
      participantId: payout.participantId,
      conditionId: payout.conditionId,
      stepCompletionId: payout.stepCompletionId,
      kind: payout.kind,
      amountMinor: payout.amountMinor,
      currency: payout.currency.trim(),
      payOverride: payout.payOverride,
    });
    await this.audit.record(manager, {
      chain: payout.studyId,
      actor: null,
      action: 'payout.returned',
      subjectType: 'payout',
      subjectId: payout.id,
      data: { transferId, owedAgainAs: again?.id ?? null },
    });
  }

  private async applyFunding(
    manager: EntityManager,
    paymentIntentId: string,
    status: 'succeeded' | 'failed',
  ): Promise<void> {
    const funding = await manager.findOne(StudyFundingEntity, {
      where: { paymentIntentId },
      lock: { mode: 'pessimistic_write' },
    });
    if (!funding || funding.status === 'succeeded') return;
    await manager.update(
      StudyFundingEntity,
      { id: funding.id },
      { status, succeededAt: status === 'succeeded' ? new Date() : null },
    );
    await this.audit.record(manager, {
      chain: funding.studyId,
      actor: null,
      action: status === 'succeeded' ? 'funding.received' : 'funding.declined',
      subjectType: 'funding',
      subjectId: funding.id,
      data: { amountMinor: funding.amountMinor, paymentIntentId },
    });
  }

  // ── reconciliation ────────────────────────────────────────────────────────

  async reconciliation(studyId: string): Promise<ReconciliationDto> {
    await this.studies.require(studyId);
    // Every page, however many: the SDK's autoPagingToArray stops at 10,000 items.
    const transfers: Stripe.Transfer[] = [];
    await this.payments.call('the reconciliation', async (provider) => {
      for await (const transfer of provider.transfers.list({ transfer_group: `study_${studyId}`, limit: 100 }))
        transfers.push(transfer);
    });
    const ledger = await this.dataSource.getRepository(PayoutEntity).find({ where: { studyId } });
    return reconcile(
      ledger.map((p) => ({ id: p.id, status: p.status, amountMinor: p.amountMinor, transferId: p.providerTransferId })),
      transfers.map((t) => ({
        id: t.id,
        amountMinor: t.amount,
        reversed: t.reversed,
        payoutId: t.metadata?.payoutId ?? null,
      })),
    );
  }

  // ── funding and budget ────────────────────────────────────────────────────

  async createFunding(actor: AuditActor, studyId: string, amountMinor: number): Promise<FundingIntentDto> {
    const study = await this.studies.require(studyId);
    if (study.status === 'closed') throw new DomainException('CONFLICT', 'A closed study takes no more funding.');
    const intent = await this.payments.call('the funding', (provider) =>
      provider.paymentIntents.create({
        amount: amountMinor,
        currency: study.currency.trim().toLowerCase(),
        allowed_payment_method_types: ['card'],
        description: `Funding for ${study.title}`,
        metadata: { studyId, purpose: 'study-funding' },
      }),
    );
    const funding = await this.dataSource.transaction(async (manager) => {
      const saved = await manager.save(
        manager.create(StudyFundingEntity, {
          studyId,
          paymentIntentId: intent.id,
          amountMinor,
          currency: study.currency,
          status: 'pending',
          createdBy: actor.id,
        }),
      );
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'funding.started',
        subjectType: 'funding',
        subjectId: saved.id,
        data: { amountMinor, paymentIntentId: intent.id },
      });
      return saved;
    });
    return {
      fundingId: funding.id,
      clientSecret: intent.client_secret!,
      publishableKey: this.config.stripePublishableKey,
      scriptUrl: this.config.stripeScriptUrl,
      amountMinor,
      currency: study.currency,
    };
  }

  /** Asks the provider directly, for when the browser says it succeeded before the webhook arrives. */
  async refreshFunding(studyId: string, fundingId: string): Promise<BudgetDto> {
    const funding = await this.dataSource
      .getRepository(StudyFundingEntity)
      .findOne({ where: { id: fundingId, studyId } });
    if (!funding) throw new DomainException('NOT_FOUND', 'No such funding for this study.');
    const intent = await this.payments.call('checking the funding', (provider) =>
      provider.paymentIntents.retrieve(funding.paymentIntentId),
    );
    if (intent.status === 'succeeded' || intent.status === 'canceled') {
      await this.dataSource.transaction((manager) =>
        this.applyFunding(manager, intent.id, intent.status === 'succeeded' ? 'succeeded' : 'failed'),
      );
    }
    return this.budget(studyId);
  }

  async budget(studyId: string): Promise<BudgetDto> {
    const study = await this.studies.require(studyId);
    const totals = await this.balance(this.dataSource.manager, studyId);
    const fundings = await this.dataSource
      .getRepository(StudyFundingEntity)
      .find({ where: { studyId }, order: { createdAt: 'DESC' } });
    return {
      currency: study.currency,
      plannedMinor: study.budgetMinor,
      ...totals,
      fundings: fundings.map((f) => ({
        id: f.id,
        amountMinor: f.amountMinor,
        status: f.status,
        createdAt: f.createdAt.toISOString(),
        succeededAt: f.succeededAt?.toISOString() ?? null,
      })),
    };
  }

  // ── the participant's side ────────────────────────────────────────────────

  async accountStatus(user: SessionUser, refresh = true): Promise<PayoutAccountStatusDto> {
    const account = await this.dataSource.getRepository(PayoutAccountEntity).findOne({ where: { userId: user.id } });
    if (!account) return { exists: false, payoutsEnabled: false, onboarding: 'none' };
    if (refresh && !account.payoutsEnabled) {
      try {
        await this.dataSource.transaction(async (manager) =>
          this.updateAccountState(manager, await this.provider.accounts.retrieve(account.providerAccountId)),
        );
      } catch (error) {
        this.logger.warn(`could not refresh account ${account.providerAccountId}: ${(error as Error).message}`);
      }
    }
    const current = (await this.dataSource.getRepository(PayoutAccountEntity).findOne({ where: { userId: user.id } }))!;
    return { exists: true, payoutsEnabled: current.payoutsEnabled, onboarding: current.onboardingState };
  }

  /** Creates the participant's connected account on first use and a fresh single-use onboarding link. */
  async startOnboarding(user: SessionUser): Promise<OnboardingLinkDto> {
    let account = await this.dataSource.getRepository(PayoutAccountEntity).findOne({ where: { userId: user.id } });
    if (!account) {
      const created = await this.payments.call('setting up your payout account', (provider) =>
        provider.accounts.create(
          {
            type: 'express',
            email: user.email,
            capabilities: { transfers: { requested: true } },
            metadata: { userId: user.id },
          },
          { idempotencyKey: `payout-account-${user.id}` },
        ),
      );
      await this.dataSource.query(
        `INSERT INTO payout_account (user_id, provider_account_id) VALUES ($1, $2) ON CONFLICT (user_id) DO NOTHING`,
        [user.id, created.id],
      );
      account = (await this.dataSource.getRepository(PayoutAccountEntity).findOne({ where: { userId: user.id } }))!;
    }
    const providerAccountId = account.providerAccountId;
    const link = await this.payments.call('opening the payout set-up page', (provider) =>
      provider.accountLinks.create({
        account: providerAccountId,
        refresh_url: new URL('/payouts?onboarding=expired', this.config.portalUrl).toString(),
        return_url: new URL('/payouts?onboarding=done', this.config.portalUrl).toString(),
        type: 'account_onboarding',
      }),
    );
    return { url: link.url, account: await this.accountStatus(user, false) };
  }

  async myPayouts(user: SessionUser): Promise<MyPayoutsDto> {
    const rows: Array<Record<string, unknown>> = await this.dataSource.query(
      `SELECT p.id, p.kind, p.amount_minor, p.currency, p.status, p.created_at, p.paid_at, p.receipt_number, st.title AS study_title, s.title AS step_title
       FROM payout p JOIN study st ON st.id = p.study_id
       LEFT JOIN step_completion c ON c.id = p.step_completion_id LEFT JOIN step s ON s.id = c.step_id
       WHERE p.participant_id = $1 ORDER BY p.created_at DESC`,
      [user.id],
    );
    const year = new Date().getUTCFullYear();
    const paidThisYearMinor: Record<string, number> = {};
    const pendingMinor: Record<string, number> = {};
    for (const r of rows) {
      const currency = (r.currency as string).trim();
      if (r.status === 'paid' && (r.paid_at as Date).getUTCFullYear() === year)
        paidThisYearMinor[currency] = (paidThisYearMinor[currency] ?? 0) + Number(r.amount_minor);
      if (['owed', 'approved', 'sending', 'failed'].includes(r.status as string))
        pendingMinor[currency] = (pendingMinor[currency] ?? 0) + Number(r.amount_minor);
    }
    return {
      items: rows.map((r) => ({
        id: r.id as string,
        studyTitle: r.study_title as string,
        stepTitle: (r.step_title as string | null) ?? null,
        kind: r.kind as 'step' | 'bonus',
        amountMinor: Number(r.amount_minor),
        currency: (r.currency as string).trim(),
        status: r.status as PayoutEntity['status'],
        createdAt: (r.created_at as Date).toISOString(),
        paidAt: r.paid_at ? (r.paid_at as Date).toISOString() : null,
        receipt: r.status === 'paid' ? (r.receipt_number as string | null) : null,
      })),
      account: await this.accountStatus(user),
      paidThisYearMinor,
      pendingMinor,
      taxNote:
        'Payments for taking part in research can count as income. Rules differ by country; if you are unsure, ask a tax adviser.',
    };
  }

  /** Year-to-date paid per participant of this study (across all studies), against the reporting threshold. */
  async taxThreshold(studyId: string): Promise<TaxThresholdDto> {
    const study = await this.studies.require(studyId);
    const year = new Date().getUTCFullYear();
    const rows: Array<{ participant_id: string; email: string; paid: string }> = await this.dataSource.query(
      `SELECT p.participant_id, u.email, sum(p.amount_minor) AS paid
       FROM payout p JOIN user_account u ON u.id = p.participant_id
       WHERE p.status = 'paid' AND p.currency = $2 AND p.paid_at >= make_timestamptz($3, 1, 1, 0, 0, 0, 'UTC')
         AND p.participant_id IN (SELECT participant_id FROM payout WHERE study_id = $1)
       GROUP BY 1, 2 ORDER BY paid DESC`,
      [studyId, study.currency, year],
    );
    const threshold = this.config.taxReportingThresholdMinor;
    return {
      year,
      thresholdMinor: threshold,
      currency: study.currency,
      caution: TAX_CAUTION,
      participants: rows.map((r) => {
        const paid = Number(r.paid);
        return {
          participantId: r.participant_id,
          email: r.email,
          paidThisYearMinor: paid,
          standing: thresholdStanding(paid, threshold),
        };
      }),
    };
  }

  /**
   * The finance office's CSV for a period: per participant of this study, what this study paid them in the period
   * and what they were paid in that calendar year across every study (up to the period's end), against the
   * tax-reporting threshold. Pay and tax rules are the institution's finance office's to apply.
   */
  async financeExport(studyId: string, query: FinanceExportQueryDto): Promise<{ fileName: string; csv: Buffer }> {
    const study = await this.studies.require(studyId);
    const from = parseDay(query.from, 'from');
    const to = parseDay(query.to, 'to');
    if (to < from)
      throw new DomainException('VALIDATION_FAILED', 'The period ends before it starts.', [
        { field: 'to', message: 'must be on or after the first day (from)' },
      ]);
    if (to.getTime() - from.getTime() > 366 * 86_400_000) {
      throw new DomainException('VALIDATION_FAILED', 'A period can be at most a year long.', [
        { field: 'to', message: 'must be within a year of the first day (from)' },
      ]);
    }
    const end = new Date(to.getTime() + 86_400_000);
    const yearStart = new Date(Date.UTC(to.getUTCFullYear(), 0, 1));
    const rows: Array<{ reference: string; n: string; paid: string; year_paid: string }> = await this.dataSource.query(
      `WITH period AS (
         SELECT p.participant_id, min(e.reference) AS reference, count(*) AS n, sum(p.amount_minor) AS paid
         FROM payout p JOIN enrollment e ON e.id = p.enrollment_id
         WHERE p.study_id = $1 AND p.status = 'paid' AND p.paid_at >= $2 AND p.paid_at < $3
         GROUP BY p.participant_id
       )
       SELECT period.reference, period.n, period.paid,
              (SELECT coalesce(sum(y.amount_minor), 0) FROM payout y
                WHERE y.participant_id = period.participant_id AND y.status = 'paid' AND y.currency = $5 AND y.paid_at >= $4 AND y.paid_at < $3) AS year_paid
       FROM period ORDER BY period.reference`,
      [studyId, from, end, yearStart, study.currency],
    );
    const csv = financeExportCsv(
      rows.map((r) => ({
        participantReference: r.reference,
        paymentsInPeriod: Number(r.n),
        paidInPeriodMinor: Number(r.paid),
        paidThisYearMinor: Number(r.year_paid),
      })),
      study.currency.trim(),
      this.config.taxReportingThresholdMinor,
    );
    return { fileName: financeExportFileName(study.slug, query.from, query.to), csv };
  }
}

/** A YYYY-MM-DD day as midnight UTC; an impossible day (2026-02-30) is refused by field. */
function parseDay(value: string, field: string): Date {
  const day = new Date(`${value}T00:00:00.000Z`);
  if (Number.isNaN(day.getTime()) || day.toISOString().slice(0, 10) !== value) {
    throw new DomainException('VALIDATION_FAILED', `${field} is not a real calendar day.`, [
      { field, message: `${value} is not a real calendar day` },
    ]);
  }
  return day;
}
