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

/** An approved payout claimed for sending, with where its money goes. */
interface ClaimedPayout {
  id: string;
  study_id: string;
  amount_minor: string;
  currency: string;
  idempotency_key: string;
  provider_account_id: string | null;
  payouts_enabled: boolean | null;
}

/** A transfer the provider made for a payout, still to be recorded. */
interface TransferMade {
  payoutId: string;
  transferId: string;
}

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
    await this.jobs.handleBatch<{ payoutId: string }>(
      JOB_NAMES.sendPayout,
      (jobs) => this.sendMany(jobs.map((job) => job.payload.payoutId)),
      { onGiveUp: ({ payoutId }, reason) => this.giveUp(payoutId, reason) },
    );
  }

  private get provider(): Stripe {
    return this.payments.client;
  }

  /** Sends one approved payout (see sendMany); throws when it has to be tried again. */
  async send(payoutId: string): Promise<void> {
    const [failure] = await this.sendMany([payoutId]);
    if (failure !== null) throw failure;
  }

  /**
   * Sends a batch of approved payouts: one statement claims them all, the provider calls go side by side, and one
   * transaction records every transfer made. Each transfer's Idempotency-Key is its payout's own key, so however
   * often this runs (a retry after a timeout, a crash between sending and recording) the provider makes one transfer
   * per payout. Answers per payout, in order: null, or why it has to be tried again.
   */
  async sendMany(payoutIds: string[]): Promise<unknown[]> {
    const unique = [...new Set(payoutIds)];
    // The claim takes each row lock only for this statement; a payout no longer approved (paid meanwhile,
    // cancelled) is not returned and is left alone.
    const claimed = await queryRows<ClaimedPayout>(
      this.dataSource.manager,
      `WITH claimed AS (
         UPDATE payout SET status = 'sending', attempts = attempts + 1, sent_at = coalesce(sent_at, now()), updated_at = now()
         WHERE id = ANY($1::uuid[]) AND status IN ('approved', 'sending')
         RETURNING id, study_id, participant_id, amount_minor, currency, idempotency_key
       )
       SELECT claimed.*, a.provider_account_id, a.payouts_enabled FROM claimed LEFT JOIN payout_account a ON a.user_id = claimed.participant_id`,
      [unique],
    );
    const byId = new Map(claimed.map((payout) => [payout.id, payout]));
    const attempts = await Promise.all(unique.map((id) => this.transferFor(byId.get(id))));
    const made = attempts.filter((attempt): attempt is TransferMade => 'transferId' in attempt);
    let recordingFailure: unknown = null;
    if (made.length > 0) {
      try {
        await this.dataSource.transaction((manager) => this.markPaidMany(manager, made));
      } catch (error) {
        recordingFailure = error; // the transfers exist; the retries record them under the same keys
      }
    }
    const failureOf = new Map(
      unique.map((id, i) => {
        const attempt = attempts[i];
        return [id, 'transferId' in attempt ? recordingFailure : attempt.failure];
      }),
    );
    return payoutIds.map((id) => failureOf.get(id) ?? null);
  }

  /** One claimed payout's transfer at the provider, or why there is none (final refusals end the payout failed). */
  private async transferFor(payout: ClaimedPayout | undefined): Promise<TransferMade | { failure: unknown }> {
    if (!payout) return { failure: null };
    const claimed = { id: payout.id, studyId: payout.study_id };
    if (!payout.payouts_enabled || !payout.provider_account_id) {
      await this.markFailed(claimed, 'The participant has not finished setting up how they get paid.');
      return { failure: null };
    }
    try {
      const transfer = await this.provider.transfers.create(
        {
          amount: Number(payout.amount_minor),
          currency: payout.currency.trim().toLowerCase(),
          destination: payout.provider_account_id,
          transfer_group: `study_${payout.study_id}`,
          metadata: { payoutId: payout.id, studyId: payout.study_id },
        },
        { idempotencyKey: payout.idempotency_key },
      );
      this.afterTransferCreated?.(payout.id);
      return { payoutId: payout.id, transferId: transfer.id };
    } catch (error) {
      if (isFinalRefusal(error)) {
        await this.markFailed(claimed, error.message);
        return { failure: null };
      }
      return { failure: error }; // a timeout, a 5xx, a rate limit or a crash before recording: retried, same key
    }
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
    const run = (m: EntityManager) => this.markPaidMany(m, [{ payoutId, transferId }]);
    if (manager) await run(manager);
    else await this.dataSource.transaction(run);
  }

  /** markPaid for many transfers in one transaction: one update, one receipt number range per study, one audit write. */
  private async markPaidMany(manager: EntityManager, transfers: TransferMade[]): Promise<void> {
    const paid = await queryRows<{ id: string; study_id: string; amount_minor: string; provider_transfer_id: string }>(
      manager,
      `UPDATE payout p SET status = 'paid', provider_transfer_id = t.transfer_id, paid_at = now(), failure_reason = NULL, updated_at = now()
       FROM unnest($1::uuid[], $2::text[]) AS t(id, transfer_id)
       WHERE p.id = t.id AND p.status IN ('approved', 'sending', 'failed')
       RETURNING p.id, p.study_id, p.amount_minor, p.provider_transfer_id`,
      [transfers.map((t) => t.payoutId), transfers.map((t) => t.transferId)],
    );
    if (paid.length === 0) return;
    // Numbered only once paid, under each study's counter row lock (taken in study order, so two batches never wait
    // on each other crosswise), so a study's receipts count 1, 2, 3… without gaps.
    const numbers = new Map<string, string>();
    const studies = [...new Set(paid.map((p) => p.study_id))].sort();
    for (const studyId of studies) {
      const ofStudy = paid.filter((p) => p.study_id === studyId);
      const [counter] = await queryRows<{ last_number: number; slug: string }>(
        manager,
        `WITH next AS (
           INSERT INTO payout_receipt_counter (study_id, last_number) VALUES ($1, $2)
           ON CONFLICT (study_id) DO UPDATE SET last_number = payout_receipt_counter.last_number + $2 RETURNING last_number
         ) SELECT next.last_number, s.slug FROM next, study s WHERE s.id = $1`,
        [studyId, ofStudy.length],
      );
      const first = counter.last_number - ofStudy.length + 1;
      ofStudy.forEach((p, i) => numbers.set(p.id, receiptNumber(counter.slug, first + i)));
    }
    await manager.query(
      `UPDATE payout p SET receipt_number = n.receipt_number FROM unnest($1::uuid[], $2::text[]) AS n(id, receipt_number) WHERE p.id = n.id`,
      [[...numbers.keys()], [...numbers.values()]],
    );
    await this.jobs.enqueueMany(
      manager,
      JOB_NAMES.payoutReceipt,
      paid.map((p) => ({ payoutId: p.id })),
    );
    for (const p of paid) {
      await this.audit.record(manager, {
        chain: p.study_id,
        actor: null,
        action: 'payout.delivered',
        subjectType: 'payout',
        subjectId: p.id,
        data: { transferId: p.provider_transfer_id, amountMinor: Number(p.amount_minor) },
      });
    }
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
