import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import { AuditActor, AuditService } from '../audit';
import { StepsService } from '../steps';
import { EnrollmentException } from './enrollment.exception';
import { EnrollmentEntity } from './entities/enrollment.entity';

/**
 * Follow-up after assignment: undoing a "lost to follow-up" mark when the person turns up again. The mark itself is
 * set by WithdrawalService.markLost; the dropout counts and flow are computed from the status, so they follow.
 */
@Injectable()
export class FollowUpService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly steps: StepsService,
  ) {}

  /** Back to taking part: active when they finished any step before, otherwise assigned. */
  async undoLost(actor: AuditActor, studyId: string, enrollmentId: string, reason: string): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const enrollment = await manager.findOne(EnrollmentEntity, {
        where: { id: enrollmentId, studyId },
        lock: { mode: 'pessimistic_write' },
      });
      if (!enrollment) throw new EnrollmentException('NOT_FOUND', 'No such participant in this study.');
      if (enrollment.status !== 'lost')
        throw new EnrollmentException(
          'PARTICIPATION_STATE',
          'This person is not marked lost to follow-up, so there is nothing to undo.',
        );
      const earlier = { lostAt: enrollment.lostAt?.toISOString() ?? null, lostReason: enrollment.lostReason };
      const finishedSteps = await this.steps.completionsOf(enrollmentId, manager);
      enrollment.status = finishedSteps.length > 0 ? 'active' : 'assigned';
      enrollment.lostAt = null;
      enrollment.lostReason = null;
      await manager.save(enrollment);
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'enrollment.lost-undone',
        subjectType: 'enrollment',
        subjectId: enrollmentId,
        data: { reason, status: enrollment.status, ...earlier },
      });
    });
  }
}
