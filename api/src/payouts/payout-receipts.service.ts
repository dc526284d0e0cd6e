import { Injectable, OnModuleInit } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, In } from 'typeorm';
import { formatMoney } from '../consent';
import { JOB_NAMES, JobQueueService } from '../jobs/job-queue.service';
import { MailService } from '../mail/mail.service';
import { payoutReceiptMail } from '../mail/payout-receipt-mail';
import { StudiesService } from '../studies';
import { UsersService } from '../users';
import { PayoutEntity } from './entities/payout.entity';

/** E-mails the receipt of each paid payout once, as a job queued when the payout was marked paid. */
@Injectable()
export class PayoutReceiptsService implements OnModuleInit {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly jobs: JobQueueService,
    private readonly mail: MailService,
    private readonly studies: StudiesService,
    private readonly users: UsersService,
  ) {}

  async onModuleInit(): Promise<void> {
    await this.jobs.handleBatch<{ payoutId: string }>(JOB_NAMES.payoutReceipt, (jobs) =>
      this.sendReceipts(jobs.map((job) => job.payload.payoutId)),
    );
  }

  /**
   * The receipts of one fetch of receipt jobs: the payouts read in one query, each study and payee once, the
   * e-mails sent side by side, and the ones sent marked in one update. Answers per payout: null, or why its
   * e-mail failed (that one is retried; a receipt already marked sent is never sent again).
   */
  private async sendReceipts(payoutIds: string[]): Promise<unknown[]> {
    const unique = [...new Set(payoutIds)];
    const payouts = (await this.dataSource.getRepository(PayoutEntity).find({ where: { id: In(unique) } })).filter(
      (payout) => payout.status === 'paid' && !payout.receiptSentAt,
    );
    const studyIds = [...new Set(payouts.map((payout) => payout.studyId))];
    const studies = new Map(
      (await Promise.all(studyIds.map((id) => this.studies.require(id)))).map((study) => [study.id, study]),
    );
    const payees = new Map(
      (await this.users.findActiveByIds([...new Set(payouts.map((payout) => payout.participantId))])).map((user) => [
        user.id,
        user,
      ]),
    );
    const deliveries = await Promise.allSettled(
      payouts.map(async (payout) => {
        const participant = payees.get(payout.participantId);
        if (!participant) return; // an account closed since: nothing to send, and nothing to try again
        const study = studies.get(payout.studyId)!;
        const receipt = payoutReceiptMail({
          amount: formatMoney(payout.amountMinor, payout.currency.trim()),
          studyTitle: study.title,
          receiptNumber: payout.receiptNumber,
          sentOn: payout.paidAt?.toISOString().slice(0, 10),
          labName: `${study.labName || 'The research team'}`,
        });
        await this.mail.deliver({ to: participant.email, subject: receipt.subject, text: receipt.text });
      }),
    );
    const sent = payouts.filter((_, i) => deliveries[i].status === 'fulfilled').map((payout) => payout.id);
    if (sent.length) {
      await this.dataSource.query(`UPDATE payout SET receipt_sent_at = now() WHERE id = ANY($1::uuid[])`, [sent]);
    }
    const failureOf = new Map(
      payouts.map((payout, i) => {
        const delivery = deliveries[i];
        return [payout.id, delivery.status === 'rejected' ? (delivery.reason as unknown) : null];
      }),
    );
    return payoutIds.map((id) => failureOf.get(id) ?? null);
  }
}
