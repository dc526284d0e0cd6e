import { Injectable, OnModuleInit } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import { formatMoney } from '../consent';
import { JOB_NAMES, JobQueueService } from '../jobs/job-queue.service';
import { MailService } from '../mail/mail.service';
import { payoutReceiptMail } from '../mail/payout-receipt-mail';
import { StudiesService } from '../studies';
import { UsersService } from '../users';
import { PayoutEntity } from './entities/payout.entity';

/** E-mails the receipt of a paid payout once, as a job queued when the payout was marked paid. */
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
    await this.jobs.handle<{ payoutId: string }>(JOB_NAMES.payoutReceipt, ({ payoutId }) => this.sendReceipt(payoutId));
  }

  private async sendReceipt(payoutId: string): Promise<void> {
    const payout = await this.dataSource.getRepository(PayoutEntity).findOne({ where: { id: payoutId } });
    if (!payout || payout.status !== 'paid' || payout.receiptSentAt) return;
    const study = await this.studies.require(payout.studyId);
    const participant = await this.users.findActiveById(payout.participantId);
    if (participant) {
      const receipt = payoutReceiptMail({
        amount: formatMoney(payout.amountMinor, payout.currency.trim()),
        studyTitle: study.title,
        receiptNumber: payout.receiptNumber,
        sentOn: payout.paidAt?.toISOString().slice(0, 10),
        labName: `${study.labName || 'The research team'}`,
      });
      await this.mail.deliver({ to: participant.email, subject: receipt.subject, text: receipt.text });
    }
    await this.dataSource.getRepository(PayoutEntity).update({ id: payoutId }, { receiptSentAt: new Date() });
  }
}
