import { Injectable, OnModuleInit } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager } from 'typeorm';
import { AuditActor, AuditService } from '../audit';
import { consentChangeParagraph, ConsentService, ConsentVersionEntity } from '../consent';
import { ContactsService } from '../reminders';
import { RosterReadModel } from '../reporting';
import { StudiesService } from '../studies';
import { EnrollmentEntity } from './entities/enrollment.entity';

/** A new consent version: everyone still taking part is asked to sign it, and can be reminded by e-mail. */
@Injectable()
export class ReconsentService implements OnModuleInit {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly studies: StudiesService,
    private readonly consent: ConsentService,
    private readonly contacts: ContactsService,
    private readonly rosterReads: RosterReadModel,
  ) {}

  async onModuleInit(): Promise<void> {
    this.consent.onActivation((manager, studyId, version, actor) =>
      this.requestReconsent(manager, studyId, version, actor),
    );
  }

  /** When a new version becomes active, everyone still taking part must sign it before their next step. */
  private async requestReconsent(
    manager: EntityManager,
    studyId: string,
    version: ConsentVersionEntity,
    actor: AuditActor,
  ): Promise<void> {
    const flagged = await manager
      .createQueryBuilder()
      .update(EnrollmentEntity)
      .set({ reconsentRequestedAt: () => 'now()' })
      .where(
        'study_id = :studyId AND status IN (:...statuses) AND signed_version_id IS NOT NULL AND signed_version_id <> :versionId',
        {
          studyId,
          statuses: ['assigned', 'active'],
          versionId: version.id,
        },
      )
      .execute();
    await this.audit.record(manager, {
      chain: studyId,
      actor,
      action: 'consent.reconsent-requested',
      subjectType: 'consent-version',
      subjectId: version.id,
      data: { version: version.version, enrollments: flagged.affected ?? 0 },
    });
  }

  async sendReconsentReminders(actor: AuditActor, studyId: string): Promise<number> {
    return this.dataSource.transaction(async (manager) => {
      const study = await this.studies.require(studyId, manager);
      const active = await this.consent.activeVersion(studyId, manager);
      if (!active) return 0;
      const recipients = await this.rosterReads.toAskForReconsent(manager, studyId, active.id);
      // People who signed different earlier versions are told what changed since their own.
      const summaries = new Map<string | null, string>();
      for (const recipient of recipients) {
        if (!summaries.has(recipient.signedVersionId)) {
          const changes = await this.consent.changesSince(recipient.signedVersionId, active, manager);
          summaries.set(recipient.signedVersionId, consentChangeParagraph(changes));
        }
        await this.contacts.sendEmail(manager, {
          study,
          recipient,
          template: 'email/re-consent-request',
          view: {
            formVersion: active.version,
            ethicsBoardName: 'the ethics board',
            changeSummary: summaries.get(recipient.signedVersionId) as string,
          },
          kind: 'reconsent-request',
          sentBy: actor.id,
        });
      }
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'consent.reconsent-reminded',
        subjectType: 'study',
        subjectId: studyId,
        data: { count: recipients.length },
      });
      return recipients.length;
    });
  }
}
