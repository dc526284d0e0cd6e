import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, In } from 'typeorm';
import { AuditService } from '../audit';
import { EnrollmentException } from './enrollment.exception';
import { ConsentService } from '../consent';
import { ContactsService } from '../reminders';
import { RosterReadModel } from '../reporting';
import { StepsService, stepTiming, stepWindows } from '../steps';
import { StudiesService, StudyEntity } from '../studies';
import { ParticipantRecordDto, RosterEntryDto, RosterPageDto, RosterQueryDto } from './dto/enrollment.dto';
import { EnrollmentEntity } from './entities/enrollment.entity';
import { StepViewsService } from './step-views.service';

type RosterProgress = Pick<RosterEntryDto, 'nextStep' | 'unansweredReminders' | 'suggestLost'>;

/** What staff see of a study's participants: the roster page, one participant's record, their signed copies. */
@Injectable()
export class RosterService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly studies: StudiesService,
    private readonly steps: StepsService,
    private readonly consent: ConsentService,
    private readonly contacts: ContactsService,
    private readonly rosterReads: RosterReadModel,
    private readonly stepViews: StepViewsService,
  ) {}

  async roster(studyId: string, query: RosterQueryDto): Promise<RosterPageDto> {
    const study = await this.studies.require(studyId);
    const page = await this.rosterReads.page(studyId, query);
    const ids = page.rows.map((r) => r.enrollmentId);
    const loaded = ids.length ? await this.dataSource.manager.find(EnrollmentEntity, { where: { id: In(ids) } }) : [];
    const byId = new Map(loaded.map((e) => [e.id, e]));
    const entities = ids.map((id) => byId.get(id)!);
    const labels = await this.conditionLabels(study);
    const versions = await this.consent.list(studyId);
    const progress = await this.progressOf(studyId, entities);
    return {
      items: entities.map((e, i) => this.rosterEntry(e, page.rows[i].email, labels, versions, progress.get(e.id))),
      total: page.total,
      page: query.page,
      pageSize: query.pageSize,
      countsByStatus: page.countsByStatus,
    };
  }

  private async conditionLabels(study: StudyEntity): Promise<Map<string, string>> {
    const conditions = await this.studies.listConditions(study.id);
    return new Map(conditions.map((c) => [c.id, c.internalName ?? c.code]));
  }

  /** The next step with its window, and reminders gone unanswered, for each enrollment on a roster page. */
  private async progressOf(studyId: string, enrollments: EnrollmentEntity[]): Promise<Map<string, RosterProgress>> {
    const ids = enrollments.map((e) => e.id);
    const [schedules, completions, followUp] = await Promise.all([
      this.steps.schedulesOf(studyId),
      this.steps.completionTimesOf(ids),
      this.contacts.followUpOf(studyId, ids),
    ]);
    const now = new Date();
    return new Map(
      enrollments.map((e) => {
        const done = completions.get(e.id) ?? new Map<string, Date>();
        const takingPart = ['assigned', 'active'].includes(e.status) && e.assignedAt;
        const windows = takingPart ? stepWindows(schedules, e.assignedAt!, done) : [];
        const index = windows.findIndex((w) => !done.has(w.stepId));
        const window = windows[index];
        const timing = window ? stepTiming(window, false, now) : null;
        const nextStep =
          window && timing && timing !== 'done'
            ? {
                stepId: window.stepId,
                title: schedules[index].title,
                opensAt: window.opensAt?.toISOString() ?? null,
                dueAt: window.dueAt?.toISOString() ?? null,
                timing,
              }
            : null;
        const follow = followUp.get(e.id) ?? { unansweredReminders: 0, suggestLost: false };
        return [
          e.id,
          {
            nextStep,
            unansweredReminders: follow.unansweredReminders,
            suggestLost: Boolean(takingPart) && follow.suggestLost,
          },
        ];
      }),
    );
  }

  private rosterEntry(
    e: EnrollmentEntity,
    email: string,
    labels: Map<string, string>,
    versions: Array<{ id: string; version: number }>,
    progress: RosterProgress = { nextStep: null, unansweredReminders: 0, suggestLost: false },
  ): RosterEntryDto {
    const condition = e.conditionId
      ? (labels.get(e.conditionId) ?? null)
      : e.conditionOrder
        ? e.conditionOrder.map((id) => labels.get(id) ?? '?').join(' → ')
        : null;
    return {
      id: e.id,
      reference: e.reference,
      email,
      name: e.displayName,
      status: e.status,
      condition,
      stratumKey: e.stratumKey,
      covariates: e.covariates,
      needsReconsent: e.reconsentRequestedAt !== null,
      signedVersion: versions.find((v) => v.id === e.signedVersionId)?.version ?? null,
      invitationSentAt: e.invitationSentAt?.toISOString() ?? null,
      assignedAt: e.assignedAt?.toISOString() ?? null,
      createdAt: e.createdAt.toISOString(),
      ...progress,
    };
  }

  async record(studyId: string, enrollmentId: string): Promise<ParticipantRecordDto> {
    const study = await this.studies.require(studyId);
    const enrollment = await this.dataSource
      .getRepository(EnrollmentEntity)
      .findOne({ where: { id: enrollmentId, studyId } });
    if (!enrollment) throw new EnrollmentException('NOT_FOUND', 'No such participant in this study.');
    const email = await this.rosterReads.emailOfParticipant(enrollment.participantId);
    const versions = await this.consent.list(studyId);
    const signatures = await this.consent.signaturesOf(enrollmentId);
    const story = await this.audit.storyOf(studyId, enrollment.reference);
    const progress = await this.progressOf(studyId, [enrollment]);
    return {
      enrollment: this.rosterEntry(
        enrollment,
        email ?? '',
        await this.conditionLabels(study),
        versions,
        progress.get(enrollment.id),
      ),
      steps: await this.stepViews.recordSteps(studyId, enrollment),
      withdrawalReason: enrollment.withdrawalReason,
      lostReason: enrollment.lostReason,
      exclusionReason: enrollment.exclusionReason,
      signatures: signatures.map((s) => ({
        id: s.id,
        version: versions.find((v) => v.id === s.consentVersionId)?.version ?? 0,
        signedAt: s.signedAt.toISOString(),
        typedName: s.typedName,
        meaning: s.meaning,
        textFingerprint: s.textFingerprint,
        pdfSha256: s.pdfSha256,
        ip: s.ip,
        userAgent: s.userAgent,
        hasMark: Boolean(s.mark),
      })),
      timeline: story.map((event) => ({
        at: event.at.toISOString(),
        action: event.action,
        name: event.name,
        sentence: event.sentence,
        actorEmail: event.actorEmail,
        data: event.data,
      })),
    };
  }

  async staffPdf(studyId: string, enrollmentId: string, signatureId: string) {
    const enrollment = await this.dataSource
      .getRepository(EnrollmentEntity)
      .findOne({ where: { id: enrollmentId, studyId } });
    if (!enrollment) throw new EnrollmentException('NOT_FOUND', 'No such participant in this study.');
    const pdf = await this.consent.signedPdf(enrollmentId, signatureId);
    if (!pdf) throw new EnrollmentException('NOT_FOUND', 'This signed copy is not ready yet.');
    return pdf;
  }
}
