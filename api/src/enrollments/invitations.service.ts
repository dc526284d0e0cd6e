import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import { AuditActor, AuditService } from '../audit';
import { EnrollmentException } from './enrollment.exception';
import { formatDuration, formatMoney } from '../consent';
import { ContactsService } from '../reminders';
import { RosterReadModel } from '../reporting';
import { StepsService } from '../steps';
import { StudiesService } from '../studies';
import { EnrollmentEntity } from './entities/enrollment.entity';

/** E-mails the study's invitation to people on the roster, once each unless staff send it again. */
@Injectable()
export class InvitationsService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly studies: StudiesService,
    private readonly steps: StepsService,
    private readonly contacts: ContactsService,
    private readonly rosterReads: RosterReadModel,
  ) {}

  async invite(actor: AuditActor, studyId: string, enrollmentIds: string[] | undefined): Promise<number> {
    return this.dataSource.transaction(async (manager) => {
      const study = await this.studies.require(studyId, manager);
      if (study.status !== 'recruiting')
        throw new EnrollmentException('STUDY_NOT_RECRUITING', 'Invitations go out once the study is recruiting.');
      const steps = await this.steps.list(studyId, manager);
      const recipients = await this.rosterReads.toInvite(manager, studyId, enrollmentIds);
      for (const recipient of recipients) {
        await this.contacts.sendEmail(manager, {
          study,
          recipient,
          template: 'email/study-invitation',
          view: {
            institutionName: study.labName || 'our institution',
            studySummary: study.summary || study.title,
            estimatedDuration: study.estimatedMinutes ? formatDuration(study.estimatedMinutes) : 'a short time',
            stepsPhrase: `${steps.items.length} ${steps.items.length === 1 ? 'step' : 'steps'}`,
            totalPay: formatMoney(steps.totalPayMinor, study.currency),
          },
          kind: 'invitation',
          sentBy: actor.id,
        });
        await manager.update(EnrollmentEntity, { id: recipient.enrollmentId }, { invitationSentAt: new Date() });
      }
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'roster.invited',
        subjectType: 'study',
        subjectId: studyId,
        data: { count: recipients.length },
      });
      return recipients.length;
    });
  }
}
