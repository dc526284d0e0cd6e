import { Injectable, OnModuleInit } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import Stripe from 'stripe';
import { DataSource, EntityManager } from 'typeorm';
import { AuditService } from '../audit';
import { queryRows } from '../database/raw-query';
import { JOB_NAMES, JOB_RETRY_LIMIT, JobQueueService } from '../jobs/job-queue.service';
import { PaymentsService } from '../payments/payments.service';
import { PayoutEntity } from './entities/payout.entity';
import { receiptNumber } from './pay-totals';
import { PayoutsService } from './payouts.service';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** A send attempt that must not be retried as is: the provider refused it for a reason a person has to fix. */
function isFinalRefusal(error: unknown): error is Stripe.errors.StripeError {
  if (!(error instanceof Stripe.errors.StripeError)) return false;
  const status = error.statusCode ?? 0;
  return status >= 400 && status < 500 && status !== 409 && status !== 429;
}

/**
 * Sending approved payouts through the provider and settling what its transfers say: paid (numbered, receipt
 * queued), failed (retryable), or reversed (owed again).
 */
@Injectable()
export class PayoutSendingService implements OnModuleInit {
  /** Test hook: runs after the provider created a transfer and before we record it, to play a crash there. */
  afterTransferCreated: ((payoutId: string) => void) | null = null;

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly jobs: JobQueueService,
    private readonly payments: PaymentsService,
    private readonly ledger: PayoutsService,
  ) {}

  async onModuleInit(): Promise<void> {
    await this.jobs.handle<{ payoutId: string }>(JOB_NAMES.sendPayout, ({ payoutId }) => this.send(payoutId), {
      onGiveUp: ({ payoutId }, reason) => this.giveUp(payoutId, reason),
    });
  }

  private get provider(): Stripe {
    return this.payments.client;
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

  /** A reversed transfer: the payout is marked reversed and the money is owed again as a new payout. */
  private async applyReversal(manager: EntityManager, transferId: string): Promise<void> {
    const payout = await manager.findOne(PayoutEntity, {
      where: { providerTransferId: transferId },
      lock: { mode: 'pessimistic_write' },
    });
    if (!payout || payout.status === 'reversed') return;
    await manager.update(PayoutEntity, { id: payout.id }, { status: 'reversed', reversedAt: new Date() });
    const again = await this.ledger.createOwed(manager, {
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
}
