import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, In } from 'typeorm';
import { AuditActor, AuditService } from '../audit';
import type { SessionUser } from '../common/auth/session-user';
import { JOB_NAMES, JobQueueService } from '../jobs/job-queue.service';
import { StudiesService } from '../studies';
import { ApprovalResultDto } from './dto/payout.dto';
import { PayoutEntity } from './entities/payout.entity';
import { PayoutException } from './payout.exception';
import { PayoutsService } from './payouts.service';

/** Staff approve owed payouts (within the funded balance) and retry failed ones; each approval queues a send. */
@Injectable()
export class PayoutApprovalService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly jobs: JobQueueService,
    private readonly studies: StudiesService,
    private readonly ledger: PayoutsService,
  ) {}

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
        throw new PayoutException(
          'NOT_FOUND',
          `${missing.length} payout(s) are not in this study.`,
          missing.map((id) => ({ field: 'payoutIds', message: `${id} is not a payout of this study` })),
        );
      const notOwed = payouts.filter((p) => p.status !== 'owed');
      if (notOwed.length) {
        throw new PayoutException(
          'PAYOUT_NOT_OWED',
          'Only owed payouts can be approved.',
          notOwed.map((p) => ({ field: 'payoutIds', message: `${p.id} is ${p.status}` })),
        );
      }
      const amountMinor = payouts.reduce((sum, p) => sum + p.amountMinor, 0);
      const { remainingMinor } = await this.ledger.balance(manager, studyId);
      if (amountMinor > remainingMinor) {
        throw new PayoutException(
          'BALANCE_TOO_LOW',
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
        throw new PayoutException('NOT_FOUND', 'No such payout.');
      }
      if (payout.status !== 'failed')
        throw new PayoutException(
          'PAYOUT_NOT_RETRYABLE',
          `Only failed payouts can be retried; this one is ${payout.status}.`,
        );
      const { remainingMinor } = await this.ledger.balance(manager, payout.studyId);
      if (payout.amountMinor > remainingMinor)
        throw new PayoutException(
          'BALANCE_TOO_LOW',
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
}
