import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager } from 'typeorm';
import { AuditService } from '../audit';
import type { SessionUser } from '../common/auth/session-user';
import { ReminderException } from './reminder.exception';
import { AppConfig } from '../config/app-config';
import { EmailCommonView, EmailTemplateId, EmailViews, renderEmail } from '../consent';
import { MailService } from '../mail/mail.service';
import { StudiesService } from '../studies';
import { ContactLogDto, SendStaffMessageDto } from './dto/reminders.dto';
import type { ContactKind } from './entities/contact.entity';
import { contactRecipient, unansweredReminders } from './reminders.read-model';
import { ReminderPlanService } from './reminder-plan.service';

export interface ContactToLog {
  studyId: string;
  enrollmentId: string;
  kind: ContactKind;
  subject: string;
  stepId?: string | null;
  dedupeKey?: string | null;
  sentBy?: string | null;
  sentAt?: Date;
}

/** A participant e-mail the study sends: the greeting and study details come from `study`, the rest from `view`. */
export interface ContactEmail<K extends EmailTemplateId> {
  study: { id: string; title: string; labName: string | null; contactEmail: string | null; slug: string };
  recipient: { enrollmentId: string; email: string; displayName: string | null };
  template: K;
  view: Omit<EmailViews[K], keyof EmailCommonView>;
  kind: ContactKind;
  /** The staff member who sent it; null for the system. */
  sentBy: string | null;
  /** What the contact log shows; the rendered subject unless given. */
  loggedSubject?: string;
}

/** The contact log: every message the study sends a participant, which the dropout watch compares by condition. */
@Injectable()
export class ContactsService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly plans: ReminderPlanService,
    private readonly studies: StudiesService,
    private readonly mail: MailService,
    private readonly audit: AuditService,
    private readonly config: AppConfig,
  ) {}

  /** Logs a contact in the caller's transaction; false when one with the same dedupe key was logged before. */
  async log(manager: EntityManager, contact: ContactToLog): Promise<boolean> {
    const rows: Array<{ id: string }> = await manager.query(
      `INSERT INTO contact (study_id, enrollment_id, kind, subject, step_id, dedupe_key, sent_by, sent_at)
       VALUES ($1, $2, $3, $4, $5, $6, $7, coalesce($8::timestamptz, now()))
       ON CONFLICT (enrollment_id, dedupe_key) WHERE dedupe_key IS NOT NULL DO NOTHING RETURNING id`,
      [
        contact.studyId,
        contact.enrollmentId,
        contact.kind,
        contact.subject.slice(0, 300),
        contact.stepId ?? null,
        contact.dedupeKey ?? null,
        contact.sentBy ?? null,
        contact.sentAt ?? null,
      ],
    );
    return rows.length > 0;
  }

  /** Renders a participant e-mail, queues it and logs the contact, all in the caller's transaction. */
  async sendEmail<K extends EmailTemplateId>(manager: EntityManager, contact: ContactEmail<K>): Promise<void> {
    const { study, recipient } = contact;
    const common: EmailCommonView = {
      participantName: recipient.displayName,
      studyTitle: study.title,
      labName: study.labName || 'The research team',
      investigatorName: study.labName || 'The research team',
      contactEmail: study.contactEmail ?? this.config.mailFrom,
      portalUrl: new URL(`/s/${study.slug}`, this.config.portalUrl).toString(),
    };
    const email = renderEmail(contact.template, { ...common, ...contact.view } as EmailViews[K]);
    await this.mail.enqueue(manager, {
      to: recipient.email,
      subject: email.subject,
      text: email.text,
      html: email.html,
    });
    await this.log(manager, {
      studyId: study.id,
      enrollmentId: recipient.enrollmentId,
      kind: contact.kind,
      subject: contact.loggedSubject ?? email.subject,
      sentBy: contact.sentBy,
    });
  }

  async logOf(studyId: string, enrollmentId: string): Promise<ContactLogDto> {
    if (!(await contactRecipient(this.dataSource.manager, studyId, enrollmentId)))
      throw new ReminderException('NOT_FOUND', 'No such participant in this study.');
    const rows: Array<{
      id: string;
      kind: ContactKind;
      sent_at: Date;
      subject: string;
      step_title: string | null;
      sent_by_email: string | null;
    }> = await this.dataSource.query(
      `SELECT c.id, c.kind, c.sent_at, c.subject, s.title AS step_title, u.email AS sent_by_email
         FROM contact c LEFT JOIN step s ON s.id = c.step_id LEFT JOIN user_account u ON u.id = c.sent_by
        WHERE c.enrollment_id = $1 ORDER BY c.sent_at DESC, c.id`,
      [enrollmentId],
    );
    const unanswered = (await unansweredReminders(this.dataSource.manager, [enrollmentId])).get(enrollmentId) ?? 0;
    const plan = await this.plans.settingsOf(studyId);
    return {
      items: rows.map((r) => ({
        id: r.id,
        kind: r.kind,
        sentAt: r.sent_at.toISOString(),
        subject: r.subject,
        stepTitle: r.step_title,
        sentByEmail: r.sent_by_email,
      })),
      unansweredReminders: unanswered,
      suggestLostAfter: plan.suggestLostAfter,
      suggestLost: unanswered >= plan.suggestLostAfter,
    };
  }

  /** Unanswered reminders for many enrollments, and whether each reached the study's threshold. */
  async followUpOf(
    studyId: string,
    enrollmentIds: string[],
  ): Promise<Map<string, { unansweredReminders: number; suggestLost: boolean }>> {
    const counts = await unansweredReminders(this.dataSource.manager, enrollmentIds);
    const { suggestLostAfter } = await this.plans.settingsOf(studyId);
    return new Map(
      enrollmentIds.map((id) => [
        id,
        { unansweredReminders: counts.get(id) ?? 0, suggestLost: (counts.get(id) ?? 0) >= suggestLostAfter },
      ]),
    );
  }

  async sendStaffMessage(
    actor: SessionUser,
    studyId: string,
    enrollmentId: string,
    input: SendStaffMessageDto,
  ): Promise<ContactLogDto> {
    await this.dataSource.transaction(async (manager) => {
      const study = await this.studies.require(studyId, manager);
      const recipient = await contactRecipient(manager, studyId, enrollmentId);
      if (!recipient) throw new ReminderException('NOT_FOUND', 'No such participant in this study.');
      if (['withdrew', 'excluded'].includes(recipient.status)) {
        throw new ReminderException(
          'PERSON_NOT_TAKING_PART',
          'This person is no longer taking part; the study does not contact them.',
        );
      }
      await this.sendEmail(manager, {
        study,
        recipient: { enrollmentId, email: recipient.email, displayName: recipient.displayName },
        template: 'email/staff-message',
        view: { subject: input.subject, message: input.message },
        kind: 'staff-message',
        sentBy: actor.id,
        loggedSubject: input.subject,
      });
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'contact.message-sent',
        subjectType: 'enrollment',
        subjectId: enrollmentId,
        data: { subject: input.subject },
      });
    });
    return this.logOf(studyId, enrollmentId);
  }
}
