import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import { AuditActor, AuditService } from '../audit';
import { DomainException } from '../common/errors/domain.exception';
import { AppConfig } from '../config/app-config';
import { formatDuration, formatMoney, renderEmail } from '../consent';
import { MailService } from '../mail/mail.service';
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
    private readonly config: AppConfig,
    private readonly audit: AuditService,
    private readonly studies: StudiesService,
    private readonly steps: StepsService,
    private readonly mail: MailService,
    private readonly contacts: ContactsService,
    private readonly rosterReads: RosterReadModel,
  ) {}

  async invite(actor: AuditActor, studyId: string, enrollmentIds: string[] | undefined): Promise<number> {
    return this.dataSource.transaction(async (manager) => {
      const study = await this.studies.require(studyId, manager);
      if (study.status !== 'recruiting')
        throw new DomainException('STUDY_NOT_RECRUITING', 'Invitations go out once the study is recruiting.');
      const steps = await this.steps.list(studyId, manager);
      const recipients = await this.rosterReads.toInvite(manager, studyId, enrollmentIds);
      const link = new URL(`/s/${study.slug}`, this.config.portalUrl).toString();
      for (const recipient of recipients) {
        const email = renderEmail('email/study-invitation', {
          participantName: recipient.displayName,
          studyTitle: study.title,
          labName: study.labName || 'The research team',
          investigatorName: study.labName || 'The research team',
          contactEmail: study.contactEmail ?? this.config.mailFrom,
          portalUrl: link,
          institutionName: study.labName || 'our institution',
          studySummary: study.summary || study.title,
          estimatedDuration: study.estimatedMinutes ? formatDuration(study.estimatedMinutes) : 'a short time',
          stepsPhrase: `${steps.items.length} ${steps.items.length === 1 ? 'step' : 'steps'}`,
          totalPay: formatMoney(steps.totalPayMinor, study.currency),
        });
        await this.mail.enqueue(manager, {
          to: recipient.email,
          subject: email.subject,
          text: email.text,
          html: email.html,
        });
        await this.contacts.log(manager, {
          studyId,
          enrollmentId: recipient.enrollmentId,
          kind: 'invitation',
          subject: email.subject,
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
