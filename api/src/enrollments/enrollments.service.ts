import type { QueryDeepPartialEntity } from 'typeorm/query-builder/QueryPartialEntity';
import { Injectable, OnModuleInit } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { randomBytes } from 'node:crypto';
import { DataSource, EntityManager } from 'typeorm';
import { AuditActor, AuditService } from '../audit';
import type { ClientInfo } from '../auth';
import type { SessionUser } from '../common/auth/session-user';
import { DomainException } from '../common/errors/domain.exception';
import { AppConfig } from '../config/app-config';
import { ConsentService } from '../consent';
import { renderEmail } from '../consent';
import { formatDuration, formatMoney } from '../consent';
import { ConsentVersionEntity } from '../consent';
import { JOB_NAMES, JobQueueService } from '../jobs/job-queue.service';
import { MailService } from '../mail/mail.service';
import { RandomizationService } from '../randomization';
import { StepsService } from '../steps';
import { stepTiming, stepWindows } from '../steps';
import { ContactsService } from '../reminders';
import { StepProgressService } from './step-progress.service';
import { PayoutsService } from '../payouts';
import { StudyEntity } from '../studies';
import { StudiesService } from '../studies';
import { UsersService } from '../users';
import {
  ImportResultDto,
  MyEnrollmentDto,
  ParticipantRecordDto,
  RosterEntryDto,
  RosterPageDto,
  RosterQueryDto,
  ScreeningResultDto,
  SignatureResultDto,
  SignConsentDto,
  WithdrawalResultDto,
} from './dto/enrollment.dto';
import { EnrollmentEntity, EnrollmentStatus } from './entities/enrollment.entity';
import { parseRoster } from './roster-import';
import { evaluateScreening, screeningProblemMessage } from './screening-rules';

type RosterProgress = Pick<RosterEntryDto, 'nextStep' | 'unansweredReminders' | 'suggestLost'>;

/** Statuses in which a person has been randomized (the denominator of attrition). */
export const RANDOMIZED_STATUSES: EnrollmentStatus[] = ['assigned', 'active', 'completed', 'withdrew', 'lost'];
const CLOSED_STATUSES: EnrollmentStatus[] = ['excluded', 'withdrew', 'lost', 'completed'];

/** Keeps a browser-reported time zone only when the runtime knows it; the signed copy then shows local time too. */
function validTimeZone(timeZone: string | undefined): string | null {
  if (!timeZone) return null;
  try {
    new Intl.DateTimeFormat('en-US', { timeZone });
    return timeZone;
  } catch {
    return null;
  }
}

function newReference(): string {
  // Pseudonymous and short enough to read over the phone; unique per study by index.
  const alphabet = 'ABCDEFGHJKLMNPQRSTUVWXYZ23456789';
  return `P-${[...randomBytes(6)].map((b) => alphabet[b % alphabet.length]).join('')}`;
}

@Injectable()
export class EnrollmentsService implements OnModuleInit {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly config: AppConfig,
    private readonly audit: AuditService,
    private readonly studies: StudiesService,
    private readonly steps: StepsService,
    private readonly consent: ConsentService,
    private readonly randomization: RandomizationService,
    private readonly users: UsersService,
    private readonly mail: MailService,
    private readonly jobs: JobQueueService,
    private readonly payouts: PayoutsService,
    private readonly stepProgress: StepProgressService,
    private readonly contacts: ContactsService,
  ) {}

  async onModuleInit(): Promise<void> {
    this.consent.onActivation((manager, studyId, version, actor) =>
      this.requestReconsent(manager, studyId, version, actor),
    );
  }

  // ── the participant's own enrollment ──────────────────────────────────────

  async join(user: SessionUser, studyId: string): Promise<{ created: boolean; enrollment: MyEnrollmentDto }> {
    if (user.role !== 'participant')
      throw new DomainException('FORBIDDEN', 'Staff accounts cannot take part in studies.');
    const created = await this.dataSource.transaction(async (manager) => {
      const study = await this.studies.require(studyId, manager);
      const existing = await manager.findOne(EnrollmentEntity, { where: { studyId, participantId: user.id } });
      if (existing) return false;
      if (study.status !== 'recruiting')
        throw new DomainException('STUDY_NOT_RECRUITING', 'This study is not taking new participants right now.');
      const enrollment = await this.insertEnrollment(manager, studyId, user.id, { invitedAt: new Date() });
      await this.audit.record(manager, {
        chain: studyId,
        actor: user,
        action: 'enrollment.joined',
        subjectType: 'enrollment',
        subjectId: enrollment.id,
        data: { reference: enrollment.reference },
      });
      return true;
    });
    return { created, enrollment: await this.me(user, studyId) };
  }

  private async insertEnrollment(
    manager: EntityManager,
    studyId: string,
    participantId: string,
    values: Partial<EnrollmentEntity>,
  ): Promise<EnrollmentEntity> {
    for (let attempt = 0; ; attempt++) {
      const reference = newReference();
      const clash = await manager.exists(EnrollmentEntity, { where: { studyId, reference } });
      if (!clash)
        return manager.save(
          manager.create(EnrollmentEntity, { studyId, participantId, reference, status: 'invited', ...values }),
        );
      if (attempt > 5) throw new Error('could not find a free enrollment reference');
    }
  }

  private async requireMine(
    manager: EntityManager,
    user: SessionUser,
    studyId: string,
    lock = false,
  ): Promise<EnrollmentEntity> {
    const enrollment = await manager.findOne(EnrollmentEntity, {
      where: { studyId, participantId: user.id },
      ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}),
    });
    if (!enrollment) throw new DomainException('NOT_FOUND', 'You have not joined this study.');
    return enrollment;
  }

  async me(user: SessionUser, studyId: string): Promise<MyEnrollmentDto> {
    const enrollment = await this.requireMine(this.dataSource.manager, user, studyId);
    return this.myView(enrollment);
  }

  private async myView(enrollment: EnrollmentEntity): Promise<MyEnrollmentDto> {
    const study = await this.studies.require(enrollment.studyId);
    const [questions, stepList, active, signatures, conditions, earned] = await Promise.all([
      this.studies.screeningQuestions(enrollment.studyId),
      this.steps.list(enrollment.studyId),
      this.consent.activeVersion(enrollment.studyId),
      this.consent.signaturesOf(enrollment.id),
      this.studies.listConditionsForParticipant(enrollment.studyId),
      this.payouts.earnedFor(enrollment.id),
    ]);
    const condition = enrollment.conditionId ? conditions.find((c) => c.id === enrollment.conditionId) : null;
    const ordered = enrollment.conditionOrder?.map((id) => conditions.find((c) => c.id === id)).filter(Boolean) ?? [];
    const assignment = condition
      ? { label: condition.participantLabel, instructions: condition.participantInstructions }
      : ordered.length
        ? {
            label: ordered.map((c) => c!.participantLabel).join(', then '),
            instructions: ordered
              .map((c, i) => `${i + 1}. ${c!.participantLabel}: ${c!.participantInstructions}`)
              .join('\n\n'),
          }
        : null;
    const needsSignature =
      Boolean(active) && enrollment.signedVersionId !== active?.id && !CLOSED_STATUSES.includes(enrollment.status);
    const lastSignature = signatures[signatures.length - 1];
    return {
      id: enrollment.id,
      reference: enrollment.reference,
      studyId: study.id,
      studyTitle: study.title,
      studySlug: study.slug,
      currency: study.currency,
      status: enrollment.status,
      next: this.nextFor(enrollment, needsSignature),
      screening: { questions, answers: enrollment.screeningAnswers, exclusionReason: enrollment.exclusionReason },
      consent: {
        activeVersionId: active?.id ?? null,
        signedVersionId: enrollment.signedVersionId,
        needsSignature,
        signedAt: lastSignature?.signedAt.toISOString() ?? null,
      },
      assignment,
      steps: await this.stepProgress.participantSteps(enrollment, stepList, needsSignature),
      earned,
      withdrewAt: enrollment.withdrewAt?.toISOString() ?? null,
    };
  }

  private nextFor(enrollment: EnrollmentEntity, needsSignature: boolean): MyEnrollmentDto['next'] {
    switch (enrollment.status) {
      case 'invited':
        return 'screening';
      case 'screened':
      case 'consented':
        return 'consent';
      case 'excluded':
        return 'excluded';
      case 'withdrew':
        return 'withdrawn';
      case 'completed':
        return 'done';
      default:
        return needsSignature ? 're-consent' : 'steps';
    }
  }

  async submitScreening(
    user: SessionUser,
    studyId: string,
    answers: Record<string, unknown>,
  ): Promise<ScreeningResultDto> {
    const outcome = await this.dataSource.transaction(async (manager) => {
      const enrollment = await this.requireMine(manager, user, studyId, true);
      if (!['invited', 'screened', 'excluded'].includes(enrollment.status)) {
        throw new DomainException(
          'CONFLICT',
          'Your screening answers are final once you have signed the consent form.',
        );
      }
      const definition = await this.studies.screeningDefinition(studyId, manager);
      const result = evaluateScreening(definition.eligibility, definition.stratification, answers);
      if (result.errors.length > 0) {
        const labels = Object.fromEntries(
          [...definition.eligibility, ...definition.stratification].map((q) => [q.key, q.label]),
        );
        throw new DomainException('VALIDATION_FAILED', screeningProblemMessage(result.errors, labels), result.errors);
      }
      enrollment.screeningAnswers = result.answers;
      enrollment.covariates = result.covariates;
      enrollment.screenedAt = new Date();
      if (result.eligible) {
        enrollment.status = 'screened';
        enrollment.exclusionReason = null;
        enrollment.excludedAt = null;
      } else {
        enrollment.status = 'excluded';
        enrollment.exclusionReason = result.reasons.join('; ');
        enrollment.excludedAt = new Date();
      }
      await manager.save(enrollment);
      await this.audit.record(manager, {
        chain: studyId,
        actor: user,
        action: result.eligible ? 'enrollment.screened' : 'enrollment.excluded',
        subjectType: 'enrollment',
        subjectId: enrollment.id,
        data: result.eligible ? {} : { reasons: result.reasons },
      });
      return result;
    });
    return { eligible: outcome.eligible, reasons: outcome.reasons, enrollment: await this.me(user, studyId) };
  }

  async consentToSign(user: SessionUser, studyId: string) {
    await this.requireMine(this.dataSource.manager, user, studyId);
    const active = await this.consent.activeVersion(studyId);
    if (!active) throw new DomainException('NOT_FOUND', 'The consent form for this study is not available yet.');
    return this.consent.participantView(active);
  }

  /**
   * Signs the active consent version. In one transaction: the signature, the assignment (first signature only),
   * the audit events and the job that makes and e-mails the signed copy. A repeated request returns what the first
   * one did.
   */
  async sign(
    user: SessionUser,
    studyId: string,
    input: SignConsentDto,
    client: ClientInfo,
  ): Promise<{ created: boolean; result: SignatureResultDto }> {
    const { signature, created } = await this.dataSource.transaction(async (manager) => {
      const enrollment = await this.requireMine(manager, user, studyId, true);
      const terms = await this.consent.signingTerms(manager, studyId, enrollment.id);
      if (!terms) throw new DomainException('CONFLICT', 'There is no active consent form to sign.');
      const active = terms.version;
      if (input.versionId !== active.id || input.fingerprint !== active.fingerprint) {
        throw new DomainException(
          'CONSENT_VERSION_STALE',
          'The consent form has changed since you opened it. Please read the current version.',
          undefined,
          {
            currentVersion: { versionId: active.id, version: active.version, fingerprint: active.fingerprint },
          },
        );
      }
      if (terms.existing) return { signature: terms.existing, created: false };
      const firstConsent = ['screened', 'consented'].includes(enrollment.status);
      const reconsent = ['assigned', 'active'].includes(enrollment.status);
      if (!firstConsent && !reconsent) {
        throw new DomainException(
          'CONFLICT',
          enrollment.status === 'invited'
            ? 'Please answer the screening questions first.'
            : 'Your participation is closed, so there is nothing to sign.',
        );
      }
      if (firstConsent) {
        const study = await this.studies.require(studyId, manager);
        if (study.status !== 'recruiting')
          throw new DomainException('STUDY_NOT_RECRUITING', 'This study is not taking new participants right now.');
      }

      const now = new Date();
      const changes: Partial<EnrollmentEntity> = { signedVersionId: active.id, reconsentRequestedAt: null };
      // The name typed when signing is the roster's name for someone not imported with one (shown and searched).
      if (!enrollment.displayName) changes.displayName = input.typedName.trim();
      if (firstConsent) {
        // The allocator claims its slot before this transaction writes any audit event (see its lock-order note).
        const outcome = await this.randomization.allocate(manager, user, {
          studyId,
          enrollmentId: enrollment.id,
          covariates: enrollment.covariates,
        });
        Object.assign(changes, {
          status: 'assigned',
          consentedAt: now,
          assignedAt: now,
          conditionId: outcome.conditionId,
          conditionOrder: outcome.conditionOrder,
          stratumKey: outcome.stratumKey,
        });
      }
      const signature = await this.consent.recordSignature(manager, {
        enrollmentId: enrollment.id,
        version: active,
        typedName: input.typedName,
        mark: input.mark ?? null,
        timeZone: validTimeZone(input.timeZone),
        ip: client.ip,
        userAgent: client.userAgent,
      });
      // Only the columns signing changes, in one UPDATE (a save would read the row again first).
      await manager.update(
        EnrollmentEntity,
        { id: enrollment.id },
        changes as QueryDeepPartialEntity<EnrollmentEntity>,
      );
      await this.audit.record(manager, {
        chain: studyId,
        actor: user,
        action: reconsent ? 'consent.re-signed' : 'consent.signed',
        subjectType: 'enrollment',
        subjectId: enrollment.id,
        data: {
          signatureId: signature.id,
          version: active.version,
          fingerprint: active.fingerprint,
          ip: client.ip,
          userAgent: client.userAgent,
          withMark: Boolean(input.mark),
        },
      });
      await this.jobs.enqueue(manager, JOB_NAMES.signedCopy, { signatureId: signature.id });
      return { signature, created: true };
    });
    const enrollment = await this.me(user, studyId);
    return {
      created,
      result: {
        signatureId: signature.id,
        signedAt: signature.signedAt.toISOString(),
        assignment: enrollment.assignment,
        enrollment,
      },
    };
  }

  async myPdf(user: SessionUser, studyId: string) {
    const enrollment = await this.requireMine(this.dataSource.manager, user, studyId);
    const pdf = await this.consent.signedPdf(enrollment.id);
    if (!pdf)
      throw new DomainException('NOT_FOUND', 'Your signed copy is still being prepared. Please try again in a moment.');
    return pdf;
  }

  async withdrawSelf(user: SessionUser, studyId: string, reason: string | undefined): Promise<WithdrawalResultDto> {
    const enrollment = await this.dataSource.transaction((manager) =>
      this.withdraw(
        manager,
        user,
        studyId,
        () => this.requireMine(manager, user, studyId, true),
        reason,
        'participant',
      ),
    );
    const view = await this.myView(enrollment);
    return {
      withdrewAt: enrollment.withdrewAt!.toISOString(),
      earnedMinor: view.earned.earnedMinor,
      stillToBePaidMinor: view.earned.stillToBePaidMinor,
      enrollment: view,
    };
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
      throw new DomainException('CONFLICT', `A ${enrollment.status} participation cannot be withdrawn.`);
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

  // ── re-consent ────────────────────────────────────────────────────────────

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
      const rows: Array<{ id: string; email: string; display_name: string | null }> = await manager.query(
        `SELECT e.id, u.email, e.display_name FROM enrollment e JOIN user_account u ON u.id = e.participant_id
         WHERE e.study_id = $1 AND e.status IN ('assigned','active') AND e.signed_version_id IS DISTINCT FROM $2`,
        [studyId, active.id],
      );
      for (const row of rows) {
        const email = renderEmail('email/re-consent-request', {
          participantName: row.display_name,
          studyTitle: study.title,
          labName: study.labName || 'The research team',
          investigatorName: study.labName || 'The research team',
          contactEmail: study.contactEmail ?? this.config.mailFrom,
          portalUrl: new URL(`/s/${study.slug}`, this.config.portalUrl).toString(),
          formVersion: active.version,
          ethicsBoardName: 'the ethics board',
          changeSummary: 'The research team has updated the consent form for this study.',
        });
        await this.mail.enqueue(manager, { to: row.email, subject: email.subject, text: email.text, html: email.html });
        await this.contacts.log(manager, {
          studyId,
          enrollmentId: row.id,
          kind: 'reconsent-request',
          subject: email.subject,
          sentBy: actor.id,
        });
      }
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'consent.reconsent-reminded',
        subjectType: 'study',
        subjectId: studyId,
        data: { count: rows.length },
      });
      return rows.length;
    });
  }

  // ── roster (staff) ────────────────────────────────────────────────────────

  async roster(studyId: string, query: RosterQueryDto): Promise<RosterPageDto> {
    const study = await this.studies.require(studyId);
    const builder = this.dataSource
      .createQueryBuilder(EnrollmentEntity, 'e')
      .innerJoin('user_account', 'u', 'u.id = e.participant_id')
      .addSelect('u.email', 'email')
      .where('e.study_id = :studyId', { studyId });
    if (query.status) builder.andWhere('e.status = :status', { status: query.status });
    if (query.needsReconsent) builder.andWhere('e.reconsent_requested_at IS NOT NULL');
    if (query.search?.trim()) {
      const pattern = `%${query.search
        .trim()
        .toLowerCase()
        .replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
      builder.andWhere(
        '(lower(u.email) LIKE :pattern OR lower(e.display_name) LIKE :pattern OR lower(e.reference) LIKE :pattern)',
        { pattern },
      );
    }
    const total = await builder.getCount();
    const { entities, raw } = await builder
      .orderBy('e.created_at', 'DESC')
      .addOrderBy('e.id', 'ASC')
      .offset((query.page - 1) * query.pageSize)
      .limit(query.pageSize)
      .getRawAndEntities();
    const counts: Array<{ status: string; n: string }> = await this.dataSource.query(
      `SELECT status, count(*) AS n FROM enrollment WHERE study_id = $1 GROUP BY status`,
      [studyId],
    );
    const labels = await this.conditionLabels(study);
    const versions = await this.consent.list(studyId);
    const progress = await this.progressOf(studyId, entities);
    return {
      items: entities.map((e, i) => this.rosterEntry(e, raw[i].email, labels, versions, progress.get(e.id))),
      total,
      page: query.page,
      pageSize: query.pageSize,
      countsByStatus: Object.fromEntries(counts.map((c) => [c.status, Number(c.n)])),
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

  async importRoster(actor: AuditActor, studyId: string, csv: string): Promise<ImportResultDto> {
    const factors = (await this.studies.designSnapshot(studyId)).factors;
    const parsed = parseRoster(csv, factors);
    let created = 0;
    let alreadyEnrolled = 0;
    await this.dataSource.transaction(async (manager) => {
      const study = await this.studies.require(studyId, manager, true);
      if (study.status === 'closed') throw new DomainException('CONFLICT', 'A closed study takes no new participants.');
      for (const row of parsed.rows) {
        const { user } = await this.users.findOrCreateParticipant(manager, row.email);
        if (user.role !== 'participant') {
          parsed.errors.push({ line: row.line, field: 'email', message: `${row.email} belongs to a staff account` });
          continue;
        }
        const exists = await manager.exists(EnrollmentEntity, { where: { studyId, participantId: user.id } });
        if (exists) {
          alreadyEnrolled += 1;
          continue;
        }
        await this.insertEnrollment(manager, studyId, user.id, {
          covariates: row.covariates,
          displayName: row.name,
          invitedBy: actor.id,
          invitedAt: new Date(),
        });
        created += 1;
      }
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'roster.imported',
        subjectType: 'study',
        subjectId: studyId,
        data: { created, alreadyEnrolled, rowErrors: parsed.errors.length },
      });
    });
    parsed.errors.sort((a, b) => a.line - b.line);
    return { created, alreadyEnrolled, errors: parsed.errors, ignoredColumns: parsed.ignoredColumns };
  }

  async invite(actor: AuditActor, studyId: string, enrollmentIds: string[] | undefined): Promise<number> {
    return this.dataSource.transaction(async (manager) => {
      const study = await this.studies.require(studyId, manager);
      if (study.status !== 'recruiting')
        throw new DomainException('STUDY_NOT_RECRUITING', 'Invitations go out once the study is recruiting.');
      const steps = await this.steps.list(studyId, manager);
      const builder = manager
        .createQueryBuilder(EnrollmentEntity, 'e')
        .innerJoin('user_account', 'u', 'u.id = e.participant_id')
        .addSelect('u.email', 'email')
        .setLock('pessimistic_write', undefined, ['e'])
        .where("e.study_id = :studyId AND e.status = 'invited'", { studyId });
      if (enrollmentIds)
        builder.andWhere('e.id IN (:...ids)', {
          ids: enrollmentIds.length ? enrollmentIds : ['00000000-0000-0000-0000-000000000000'],
        });
      else builder.andWhere('e.invitation_sent_at IS NULL');
      const { entities, raw } = await builder.getRawAndEntities();
      const link = new URL(`/s/${study.slug}`, this.config.portalUrl).toString();
      for (const [i, enrollment] of entities.entries()) {
        const email = renderEmail('email/study-invitation', {
          participantName: enrollment.displayName,
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
          to: raw[i].email,
          subject: email.subject,
          text: email.text,
          html: email.html,
        });
        await this.contacts.log(manager, {
          studyId,
          enrollmentId: enrollment.id,
          kind: 'invitation',
          subject: email.subject,
          sentBy: actor.id,
        });
        await manager.update(EnrollmentEntity, { id: enrollment.id }, { invitationSentAt: new Date() });
      }
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'roster.invited',
        subjectType: 'study',
        subjectId: studyId,
        data: { count: entities.length },
      });
      return entities.length;
    });
  }

  /** Matched pairs: everyone on the roster with a pretest who has not consented yet forms the cohort. */
  async pairCohort(
    actor: AuditActor,
    studyId: string,
  ): Promise<{ pairs: number; leftoverEnrollmentId: string | null; cohort: number }> {
    return this.dataSource.transaction(async (manager) => {
      const scheme = await this.randomization.schemeOf(studyId, manager);
      const pretestKey = (scheme?.settings as { pretestKey?: string } | undefined)?.pretestKey;
      if (!pretestKey)
        throw new DomainException('CONFLICT', 'Pairing applies to a study whose scheme is matched pairs.');
      const rows = await manager.find(EnrollmentEntity, { where: { studyId }, order: { createdAt: 'ASC', id: 'ASC' } });
      const cohort = rows
        .filter((e) => ['invited', 'screened'].includes(e.status) && typeof e.covariates[pretestKey] === 'number')
        .map((e) => ({ enrollmentId: e.id, pretest: e.covariates[pretestKey] as number }));
      const result = await this.randomization.pairCohort(manager, actor, studyId, cohort);
      return { ...result, cohort: cohort.length };
    });
  }

  private async requireOnRoster(
    manager: EntityManager,
    studyId: string,
    enrollmentId: string,
  ): Promise<EnrollmentEntity> {
    const enrollment = await manager.findOne(EnrollmentEntity, {
      where: { id: enrollmentId, studyId },
      lock: { mode: 'pessimistic_write' },
    });
    if (!enrollment) throw new DomainException('NOT_FOUND', 'No such participant in this study.');
    return enrollment;
  }

  async markLost(
    actor: AuditActor,
    studyId: string,
    enrollmentId: string,
    reason: string | undefined,
  ): Promise<RosterEntryDto> {
    await this.dataSource.transaction(async (manager) => {
      const enrollment = await this.requireOnRoster(manager, studyId, enrollmentId);
      if (!['assigned', 'active'].includes(enrollment.status)) {
        throw new DomainException(
          'CONFLICT',
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
    return (await this.record(studyId, enrollmentId)).enrollment;
  }

  async withdrawOnBehalf(
    actor: AuditActor,
    studyId: string,
    enrollmentId: string,
    reason: string | undefined,
  ): Promise<RosterEntryDto> {
    await this.dataSource.transaction((manager) =>
      this.withdraw(
        manager,
        actor,
        studyId,
        () => this.requireOnRoster(manager, studyId, enrollmentId),
        reason,
        'staff',
      ),
    );
    return (await this.record(studyId, enrollmentId)).enrollment;
  }

  async record(studyId: string, enrollmentId: string): Promise<ParticipantRecordDto> {
    const study = await this.studies.require(studyId);
    const enrollment = await this.dataSource
      .getRepository(EnrollmentEntity)
      .findOne({ where: { id: enrollmentId, studyId } });
    if (!enrollment) throw new DomainException('NOT_FOUND', 'No such participant in this study.');
    const participant = await this.dataSource.query(`SELECT email FROM user_account WHERE id = $1`, [
      enrollment.participantId,
    ]);
    const versions = await this.consent.list(studyId);
    const signatures = await this.consent.signaturesOf(enrollmentId);
    const story = await this.audit.storyOf(studyId, enrollment.reference);
    const progress = await this.progressOf(studyId, [enrollment]);
    return {
      enrollment: this.rosterEntry(
        enrollment,
        participant[0]?.email ?? '',
        await this.conditionLabels(study),
        versions,
        progress.get(enrollment.id),
      ),
      steps: await this.stepProgress.recordSteps(studyId, enrollment),
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

  /** What the documents domain needs to address and label a signed copy. */
  async summaryOf(enrollmentId: string): Promise<{ studyId: string; reference: string; email: string }> {
    const [row] = await this.dataSource.query(
      `SELECT e.study_id, e.reference, u.email FROM enrollment e JOIN user_account u ON u.id = e.participant_id WHERE e.id = $1`,
      [enrollmentId],
    );
    if (!row) throw new DomainException('NOT_FOUND', 'No such enrollment.');
    return { studyId: row.study_id, reference: row.reference, email: row.email };
  }

  async staffPdf(studyId: string, enrollmentId: string, signatureId: string) {
    const enrollment = await this.dataSource
      .getRepository(EnrollmentEntity)
      .findOne({ where: { id: enrollmentId, studyId } });
    if (!enrollment) throw new DomainException('NOT_FOUND', 'No such participant in this study.');
    const pdf = await this.consent.signedPdf(enrollmentId, signatureId);
    if (!pdf) throw new DomainException('NOT_FOUND', 'This signed copy is not ready yet.');
    return pdf;
  }
}
