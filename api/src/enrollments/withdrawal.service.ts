import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager } from 'typeorm';
import { AuditActor, AuditService } from '../audit';
import type { SessionUser } from '../common/auth/session-user';
import { AppConfig } from '../config/app-config';
import { formatMoney, renderEmail } from '../consent';
import { MailService } from '../mail/mail.service';
import { PayoutsService } from '../payouts';
import { StudiesService } from '../studies';
import { UsersService } from '../users';
import { RosterEntryDto, WithdrawalResultDto } from './dto/enrollment.dto';
import { EnrollmentException } from './enrollment.exception';
import { requireMine, requireOnRoster } from './enrollment-lookup';
import { EnrollmentEntity } from './entities/enrollment.entity';
import { ParticipationService } from './participation.service';
import { RosterService } from './roster.service';

/** Leaving a study: withdrawing (by the participant or on their behalf) and lost to follow-up. */
@Injectable()
export class WithdrawalService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly config: AppConfig,
    private readonly audit: AuditService,
    private readonly studies: StudiesService,
    private readonly users: UsersService,
    private readonly mail: MailService,
    private readonly payouts: PayoutsService,
    private readonly participation: ParticipationService,
    private readonly roster: RosterService,
  ) {}

  async withdrawSelf(user: SessionUser, studyId: string, reason: string | undefined): Promise<WithdrawalResultDto> {
    const enrollment = await this.dataSource.transaction((manager) =>
      this.withdraw(manager, user, studyId, () => requireMine(manager, user, studyId, true), reason, 'participant'),
    );
    const view = await this.participation.myView(enrollment);
    return {
      withdrewAt: enrollment.withdrewAt!.toISOString(),
      earnedMinor: view.earned.earnedMinor,
      stillToBePaidMinor: view.earned.stillToBePaidMinor,
      enrollment: view,
    };
  }

  async withdrawOnBehalf(
    actor: AuditActor,
    studyId: string,
    enrollmentId: string,
    reason: string | undefined,
  ): Promise<RosterEntryDto> {
    await this.dataSource.transaction((manager) =>
      this.withdraw(manager, actor, studyId, () => requireOnRoster(manager, studyId, enrollmentId), reason, 'staff'),
    );
    return (await this.roster.record(studyId, enrollmentId)).enrollment;
  }

  async markLost(
    actor: AuditActor,
    studyId: string,
    enrollmentId: string,
    reason: string | undefined,
  ): Promise<RosterEntryDto> {
    await this.dataSource.transaction(async (manager) => {
      const enrollment = await requireOnRoster(manager, studyId, enrollmentId);
      if (!['assigned', 'active'].includes(enrollment.status)) {
        throw new EnrollmentException(
          'PARTICIPATION_STATE',
          'Only someone who was assigned and has not finished can be lost to follow-up.',
        );
      }
      enrollment.status = 'lost';
      enrollment.lostAt = new Date();
      enrollment.lostReason = reason?.trim() || null;
      await manager.save(enrollment);
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'enrollment.lost',
        subjectType: 'enrollment',
        subjectId: enrollmentId,
        data: { reason: enrollment.lostReason },
      });
    });
    return (await this.roster.record(studyId, enrollmentId)).enrollment;
  }

  /** Records a withdrawal; records are never deleted, and the person keeps what they earned. */
  private async withdraw(
    manager: EntityManager,
    actor: AuditActor,
    studyId: string,
    load: () => Promise<EnrollmentEntity>,
    reason: string | undefined,
    by: 'participant' | 'staff',
  ): Promise<EnrollmentEntity> {
    const enrollment = await load();
    if (enrollment.status === 'withdrew') return enrollment;
    if (['completed', 'excluded'].includes(enrollment.status)) {
      throw new EnrollmentException('PARTICIPATION_STATE', `A ${enrollment.status} participation cannot be withdrawn.`);
    }
    enrollment.status = 'withdrew';
    enrollment.withdrewAt = new Date();
    enrollment.withdrawalReason = reason?.trim() || null;
    await manager.save(enrollment);
    await this.audit.record(manager, {
      chain: studyId,
      actor,
      action: 'enrollment.withdrew',
      subjectType: 'enrollment',
      subjectId: enrollment.id,
      data: { by, reason: enrollment.withdrawalReason },
    });
    const study = await this.studies.require(studyId, manager);
    const participant = await this.users.findActiveById(enrollment.participantId);
    const earned = await this.payouts.earnedFor(enrollment.id, manager);
    if (participant) {
      const email = renderEmail('email/withdrawal-confirmation', {
        participantName: enrollment.displayName,
        studyTitle: study.title,
        labName: study.labName || 'The research team',
        investigatorName: study.labName || 'The research team',
        contactEmail: study.contactEmail ?? this.config.mailFrom,
        portalUrl: new URL(`/s/${study.slug}`, this.config.portalUrl).toString(),
        withdrawnAt: enrollment.withdrewAt.toISOString().replace('T', ' ').slice(0, 16) + ' UTC',
        earnedAmount: formatMoney(earned.earnedMinor, study.currency),
        paidAmount: formatMoney(earned.paidMinor, study.currency),
        owedAmount: formatMoney(earned.stillToBePaidMinor, study.currency),
        hasOwedAmount: earned.stillToBePaidMinor > 0,
        paymentMethod: 'the payment method you set up',
        paymentDays: 14,
      });
      await this.mail.enqueue(manager, {
        to: participant.email,
        subject: email.subject,
        text: email.text,
        html: email.html,
      });
    }
    return enrollment;
  }
}
