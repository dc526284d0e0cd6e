import { Injectable, Logger, OnModuleInit } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import type Stripe from 'stripe';
import { DataSource } from 'typeorm';
import { AppConfig } from '../config/app-config';
import { JOB_NAMES, JobQueueService } from '../jobs/job-queue.service';
import { PaymentsService } from '../payments/payments.service';
import { PayoutSendingService } from './payout-sending.service';

interface StuckPayout {
  id: string;
  study_id: string;
  provider_account_id: string | null;
}

export interface SweepResult {
  paid: number;
  failed: number;
  /** Left `sending` because the provider could not be asked; the next sweep asks again. */
  unresolved: number;
}

export const NO_TRANSFER_REASON =
  'Sending stopped before the payment provider made a transfer (the provider has no transfer for this payout). Retry it to send it again.';

/**
 * Settles payouts left `sending` (a sender that died between claiming and recording, a give-up that could not be
 * written) by asking the provider, on a schedule in the job queue. The provider is asked for the transfers of the
 * payout's study to its participant's account, and a transfer names its payout in its metadata (the send job puts
 * it there, under the payout's own Idempotency-Key): found, the payout is paid by exactly that transfer; not found,
 * it is failed and retryable, and a retry sends under the same key, so it still cannot pay twice.
 */
@Injectable()
export class PayoutRecoveryService implements OnModuleInit {
  private readonly logger = new Logger('PayoutRecovery');

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly config: AppConfig,
    private readonly jobs: JobQueueService,
    private readonly payments: PaymentsService,
    private readonly sending: PayoutSendingService,
  ) {}

  async onModuleInit(): Promise<void> {
    await this.jobs.handle(JOB_NAMES.sweepPayouts, async () => {
      const result = await this.sweep();
      if (result.paid + result.failed + result.unresolved > 0) this.logger.log(`sweep: ${JSON.stringify(result)}`);
    });
    // An empty cron turns the schedule off.
    if (this.config.payoutSweepCron) await this.jobs.schedule(JOB_NAMES.sweepPayouts, this.config.payoutSweepCron);
    else await this.jobs.unschedule(JOB_NAMES.sweepPayouts);
  }

  async sweep(now = new Date()): Promise<SweepResult> {
    const idleSince = new Date(now.getTime() - this.config.payoutStuckAfterSeconds * 1000);
    const stuck: StuckPayout[] = await this.dataSource.query(
      `SELECT p.id, p.study_id, a.provider_account_id FROM payout p LEFT JOIN payout_account a ON a.user_id = p.participant_id
        WHERE p.status = 'sending' AND p.updated_at < $1 ORDER BY p.updated_at LIMIT 5000`,
      [idleSince],
    );
    const result: SweepResult = { paid: 0, failed: 0, unresolved: 0 };
    const groups = new Map<string, StuckPayout[]>();
    for (const payout of stuck) {
      const key = `${payout.study_id}|${payout.provider_account_id ?? ''}`;
      groups.set(key, [...(groups.get(key) ?? []), payout]);
    }
    for (const group of groups.values()) {
      const { study_id: studyId, provider_account_id: destination } = group[0]!;
      let transfers: Map<string, Stripe.Transfer>;
      try {
        transfers = destination
          ? await this.transfersFor(studyId, destination, new Set(group.map((p) => p.id)))
          : new Map();
      } catch (error) {
        this.logger.warn(
          `could not ask the provider about ${group.length} payout(s) of study ${studyId}: ${(error as Error).message}`,
        );
        result.unresolved += group.length;
        continue;
      }
      for (const payout of group) {
        const transfer = transfers.get(payout.id);
        if (transfer) {
          await this.sending.settleFromTransfer(transfer);
          result.paid += 1;
        } else if (await this.sending.markFailed({ id: payout.id, studyId }, NO_TRANSFER_REASON, { idleSince })) {
          result.failed += 1;
        }
      }
    }
    return result;
  }

  /** The provider's transfers of a study to one account that name one of `payoutIds`, by payout id. */
  private async transfersFor(
    studyId: string,
    destination: string,
    payoutIds: Set<string>,
  ): Promise<Map<string, Stripe.Transfer>> {
    const found = new Map<string, Stripe.Transfer>();
    for await (const transfer of this.payments.client.transfers.list({
      transfer_group: `study_${studyId}`,
      destination,
      limit: 100,
    })) {
      const payoutId = transfer.metadata?.payoutId;
      if (payoutId && payoutIds.has(payoutId)) found.set(payoutId, transfer);
      if (found.size === payoutIds.size) break;
    }
    return found;
  }
}
