import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { stringify } from 'csv-stringify/sync';
import { DataSource, EntityManager, In } from 'typeorm';
import { AuditActor, AuditService } from '../audit';
import type { SessionUser } from '../common/auth/session-user';
import { DomainException } from '../common/errors/domain.exception';
import { ConsentService } from '../consent';
import { PayoutsService } from '../payouts';
import { PostgresThrottlerStorage } from '../rate-limit/postgres-throttler.storage';
import { BulkCompletionResultDto, BulkCompletionRowDto, StepListDto } from '../steps';
import { readReturnToken } from '../steps';
import { stepTiming, stepWindows, type CompletionVerifiedBy, type StepTiming, type StepWindow } from '../steps';
import { StepsService } from '../steps';
import { StudiesService } from '../studies';
import { MyStepDto, RecordStepDto, StepCodesDto, StepStartDto } from './dto/enrollment.dto';
import { EnrollmentEntity } from './entities/enrollment.entity';

/** Wrong completion codes allowed per enrollment per 15 minutes. */
const WRONG_CODE_LIMIT = 5;
const WRONG_CODE_WINDOW_MS = 15 * 60 * 1000;
const TAKING_PART = ['assigned', 'active'];
const DATE = new Intl.DateTimeFormat('en-GB', {
  day: 'numeric',
  month: 'long',
  year: 'numeric',
  hour: '2-digit',
  minute: '2-digit',
  timeZone: 'UTC',
  timeZoneName: 'short',
});

/** Why a return link was refused; the portal's return page explains each in plain words. */
export type ReturnRefusal =
  'malformed' | 'forged' | 'expired' | 'other-person' | 'not-open' | 'not-taking-part' | 'consent';
export type ReturnOutcome =
  | { outcome: 'done' | 'already-done'; studySlug: string; stepId: string }
  | { outcome: 'refused'; reason: ReturnRefusal; studySlug: string | null };

/** A refusal that also names what the return page should say. */
class StepRefusal extends DomainException {
  constructor(
    readonly refusal: ReturnRefusal,
    message: string,
    field = 'stepId',
    details?: Record<string, unknown>,
  ) {
    // A changed consent form has its own code, so the portal can send the person to sign it without reading the text.
    super(refusal === 'consent' ? 'CONSENT_VERSION_STALE' : 'CONFLICT', message, [{ field, message }], details);
  }
}

/**
 * Completing steps, however they are verified: a signed return link from the lab's external task, a code (the
 * participant's own or one shared by the step), or staff, one at a time or from a list. Every completion records how
 * and by whom, is owed its pay in the same transaction, and can be undone with a reason until that pay is approved.
 */
@Injectable()
export class StepProgressService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly studies: StudiesService,
    private readonly steps: StepsService,
    private readonly consent: ConsentService,
    private readonly payouts: PayoutsService,
  ) {}

  // ── what a participant sees ───────────────────────────────────────────────

  /** Each step with its window and status for the participant's own view. */
  async participantSteps(
    enrollment: EnrollmentEntity,
    stepList: StepListDto,
    needsSignature: boolean,
    now = new Date(),
  ): Promise<MyStepDto[]> {
    const completions = await this.steps.completionsOf(enrollment.id);
    const done = new Map(completions.map((c) => [c.stepId, c.completedAt]));
    const windows = this.windowsFor(enrollment, stepList, done);
    const takingPart = TAKING_PART.includes(enrollment.status) && !needsSignature;
    return stepList.items.map((step, i) => {
      const window = windows[i];
      const timing = window ? stepTiming(window, done.has(step.id), now) : done.has(step.id) ? 'done' : 'waiting';
      return {
        id: step.id,
        position: step.position,
        title: step.title,
        description: step.description,
        payMinor: step.payOverrides.find((o) => o.conditionId === enrollment.conditionId)?.payMinor ?? step.payMinor,
        status: timing === 'done' || takingPart ? timing : 'locked',
        completedAt: done.get(step.id)?.toISOString() ?? null,
        hasCompletionCode:
          step.verification === 'participant-code' || (step.verification === 'shared-code' && step.hasCompletionCode),
        verification: step.verification,
        hasTask:
          Boolean(step.taskUrl) && (step.verification === 'return-link' || step.verification === 'participant-code'),
        opensAt: window?.opensAt?.toISOString() ?? null,
        dueAt: window?.dueAt?.toISOString() ?? null,
      };
    });
  }

  /** Windows exist once someone is assigned; before that, none. */
  private windowsFor(
    enrollment: EnrollmentEntity,
    stepList: StepListDto,
    done: ReadonlyMap<string, Date>,
  ): Array<StepWindow | undefined> {
    if (!enrollment.assignedAt) return stepList.items.map(() => undefined);
    return stepWindows(stepList.items, enrollment.assignedAt, done);
  }

  /** The external task's address, with the reference and a return address signed for this person and step. */
  async startTask(user: SessionUser, studyId: string, stepId: string): Promise<StepStartDto> {
    const enrollment = await this.requireMine(this.dataSource.manager, user, studyId);
    await this.requireCanComplete(this.dataSource.manager, studyId, enrollment, stepId);
    const stepList = await this.steps.list(studyId);
    const step = stepList.items.find((s) => s.id === stepId)!;
    if (!step.taskUrl || !['return-link', 'participant-code'].includes(step.verification)) {
      throw new DomainException('CONFLICT', 'This step is not done in an external task.', [
        { field: 'stepId', message: 'has no external task' },
      ]);
    }
    const done = new Map((await this.steps.completionsOf(enrollment.id)).map((c) => [c.stepId, c.completedAt]));
    const window = this.windowsFor(enrollment, stepList, done)[stepList.items.indexOf(step)];
    const url = await this.steps.taskAddress({
      studyId,
      stepId,
      enrollmentId: enrollment.id,
      reference: enrollment.reference,
      dueAt: window?.dueAt ?? null,
      now: new Date(),
    });
    return { url };
  }

  // ── completing ────────────────────────────────────────────────────────────

  /**
   * The signed return address: checks the link and marks the step done. Anything wrong (forged, altered, expired,
   * someone else's, step not open) records nothing but the refused attempt in the audit trail.
   */
  async completeFromReturnLink(
    token: string,
    user: SessionUser | null,
    client: { ip: string | null; userAgent: string | null },
  ): Promise<ReturnOutcome> {
    const read = readReturnToken(token);
    const studyId = read?.claim.studyId;
    const study =
      studyId && /^[0-9a-f-]{36}$/.test(studyId) && (await this.studies.exists(studyId))
        ? await this.studies.require(studyId)
        : null;
    const refuse = async (reason: ReturnRefusal): Promise<ReturnOutcome> => {
      await this.audit.record(this.dataSource.manager, {
        chain: study?.id,
        actor: user ? { id: user.id, email: user.email } : { id: null, email: null },
        action: 'step.return-refused',
        subjectType: study ? 'study' : 'return-link',
        subjectId: study?.id ?? 'unknown',
        data: {
          reason,
          reference: read?.claim.reference ?? null,
          stepId: read?.claim.stepId ?? null,
          ip: client.ip,
          userAgent: client.userAgent,
        },
      });
      return { outcome: 'refused', reason, studySlug: study?.slug ?? null };
    };
    if (!read || !study) return refuse(read ? 'forged' : 'malformed');
    const check = await this.steps.checkReturnToken(study.id, token, new Date());
    if (!check.ok) return refuse(check.reason);
    const enrollment = await this.dataSource.manager.findOne(EnrollmentEntity, {
      where: { studyId: study.id, reference: check.claim.reference },
    });
    if (!enrollment) return refuse('forged');
    if (user && enrollment.participantId !== user.id) return refuse('other-person');
    try {
      const created = await this.dataSource.transaction(async (manager) => {
        const locked = await manager.findOneOrFail(EnrollmentEntity, {
          where: { id: enrollment.id },
          lock: { mode: 'pessimistic_write' },
        });
        const actor: AuditActor = user ?? { id: null, email: null };
        return this.completeStep(manager, actor, study.id, locked, check.claim.stepId, 'return-link', {
          keyId: check.keyId,
          linkExpiresAt: check.claim.expiresAt.toISOString(),
          ip: client.ip,
        });
      });
      return { outcome: created ? 'done' : 'already-done', studySlug: study.slug, stepId: check.claim.stepId };
    } catch (error) {
      if (error instanceof StepRefusal) return refuse(error.refusal);
      if (error instanceof DomainException && error.code === 'NOT_FOUND') return refuse('forged');
      throw error;
    }
  }

  /** A participant confirms a step with a code: their own on per-participant steps, or the step's shared code. */
  async completeWithCode(user: SessionUser, studyId: string, stepId: string, code: string): Promise<void> {
    const enrollment = await this.requireMine(this.dataSource.manager, user, studyId);
    const limiterKey = `wrong-code:${enrollment.id}`;
    // Only wrong codes count, so the same window store as sign-in is used directly rather than as a route guard.
    const limiter = new PostgresThrottlerStorage(this.dataSource);
    if ((await limiter.hitsInWindow(limiterKey)) >= WRONG_CODE_LIMIT) {
      throw new DomainException(
        'RATE_LIMITED',
        'Too many wrong codes. Please wait 15 minutes, or ask the research team to check the step off.',
      );
    }
    const { matched, verifiedBy } = await this.steps.checkCode(studyId, stepId, enrollment.id, code);
    if (!matched) {
      await limiter.increment(limiterKey, WRONG_CODE_WINDOW_MS, WRONG_CODE_LIMIT);
      await this.audit.record(this.dataSource.manager, {
        chain: studyId,
        actor: user,
        action: 'step.code-refused',
        subjectType: 'enrollment',
        subjectId: enrollment.id,
        data: { stepId, verification: verifiedBy },
      });
      throw new DomainException('VALIDATION_FAILED', 'That code does not match this step.', [
        { field: 'code', message: 'does not match; check it and try again' },
      ]);
    }
    await this.dataSource.transaction(async (manager) => {
      const locked = await this.requireMine(manager, user, studyId, true);
      await this.completeStep(manager, user, studyId, locked, stepId, verifiedBy, {});
    });
  }

  async completeByStaff(actor: SessionUser, studyId: string, enrollmentId: string, stepId: string): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const enrollment = await this.requireOnRoster(manager, studyId, enrollmentId);
      await this.completeStep(manager, actor, studyId, enrollment, stepId, 'staff', {});
    });
  }

  /**
   * Marks one step done for every reference in a pasted or uploaded list. Each line is checked and written on its
   * own, so a bad line (unknown reference, not taking part, step not open) writes nothing and the rest go through.
   */
  async completeList(
    actor: SessionUser,
    studyId: string,
    stepId: string,
    references: string[],
  ): Promise<BulkCompletionResultDto> {
    await this.steps.requireStepOf(studyId, stepId);
    const wanted = references.map((r) => r.trim().toUpperCase());
    const found = await this.dataSource.manager.find(EnrollmentEntity, {
      where: { studyId, reference: In([...new Set(wanted.filter(Boolean))]) },
    });
    const byReference = new Map(found.map((e) => [e.reference, e]));
    const seen = new Set<string>();
    const rows: BulkCompletionRowDto[] = [];
    for (const [i, reference] of wanted.entries()) {
      const row = (outcome: BulkCompletionRowDto['outcome'], message: string | null) =>
        rows.push({ line: i + 1, reference: references[i].trim(), outcome, message });
      const enrollment = byReference.get(reference);
      if (!reference) row('failed', 'empty line');
      else if (!enrollment) row('failed', 'no participant with this reference in the study');
      else if (seen.has(reference)) row('failed', 'listed twice; the first line counts');
      else {
        seen.add(reference);
        try {
          const created = await this.dataSource.transaction(async (manager) => {
            const locked = await manager.findOneOrFail(EnrollmentEntity, {
              where: { id: enrollment.id },
              lock: { mode: 'pessimistic_write' },
            });
            return this.completeStep(manager, actor, studyId, locked, stepId, 'staff-list', { line: i + 1 });
          });
          row(created ? 'completed' : 'already-done', null);
        } catch (error) {
          if (!(error instanceof DomainException)) throw error;
          row('failed', error.message);
        }
      }
    }
    const count = (outcome: BulkCompletionRowDto['outcome']) => rows.filter((r) => r.outcome === outcome).length;
    const result = { completed: count('completed'), alreadyDone: count('already-done'), failed: count('failed'), rows };
    await this.audit.record(this.dataSource.manager, {
      chain: studyId,
      actor,
      action: 'step.list-marked',
      subjectType: 'step',
      subjectId: stepId,
      data: {
        lines: rows.length,
        completed: result.completed,
        alreadyDone: result.alreadyDone,
        failed: rows
          .filter((r) => r.outcome === 'failed')
          .map((r) => ({ line: r.line, reference: r.reference.slice(0, 40), message: r.message })),
      },
    });
    return result;
  }

  /** Undoes a completion with a reason, only while its payout has not been approved; the record keeps it as history. */
  async undo(actor: SessionUser, studyId: string, enrollmentId: string, stepId: string, reason: string): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const enrollment = await this.requireOnRoster(manager, studyId, enrollmentId);
      const completion = await this.steps.undoCompletion(manager, { enrollmentId, stepId, undoneBy: actor.id, reason });
      const wasCompleted = enrollment.status === 'completed';
      await this.payouts.cancelOwedFor(manager, { enrollmentId, stepCompletionId: completion.id, bonus: wasCompleted });
      if (wasCompleted) {
        enrollment.status = 'active';
        enrollment.completedAt = null;
      }
      if (enrollment.status === 'active' && (await this.steps.completionsOf(enrollmentId, manager)).length === 0)
        enrollment.status = 'assigned';
      await manager.save(enrollment);
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'step.completion-undone',
        subjectType: 'enrollment',
        subjectId: enrollmentId,
        data: { stepId, reason, completedAt: completion.completedAt.toISOString(), verifiedBy: completion.verifiedBy },
      });
    });
  }

  /**
   * One completed step: recorded once, owed its pay (the same in every condition unless an override was recorded),
   * and the enrollment moves to active, or to completed with any completion bonus after the last step. Returns
   * false when the step was already done.
   */
  private async completeStep(
    manager: EntityManager,
    actor: AuditActor,
    studyId: string,
    enrollment: EnrollmentEntity,
    stepId: string,
    verifiedBy: CompletionVerifiedBy,
    evidence: Record<string, unknown>,
  ): Promise<boolean> {
    // Done already (a second return, a repeated code, a list that lists it again): nothing more is owed.
    if ((await this.steps.completionsOf(enrollment.id, manager)).some((c) => c.stepId === stepId)) return false;
    await this.requireCanComplete(manager, studyId, enrollment, stepId);
    const study = await this.studies.require(studyId, manager);
    const outcome = await this.steps.recordCompletion(manager, {
      studyId,
      enrollmentId: enrollment.id,
      stepId,
      conditionId: enrollment.conditionId,
      verifiedBy,
      recordedBy: actor.id,
      evidence,
    });
    if (!outcome.created) return false;
    const owedBase = {
      studyId,
      enrollmentId: enrollment.id,
      participantId: enrollment.participantId,
      conditionId: enrollment.conditionId,
      currency: study.currency,
    };
    await this.payouts.createOwed(manager, {
      ...owedBase,
      stepCompletionId: outcome.completion.id,
      kind: 'step',
      amountMinor: outcome.payMinor,
      payOverride: outcome.payOverride,
    });
    enrollment.status = outcome.remainingSteps === 0 ? 'completed' : 'active';
    if (outcome.remainingSteps === 0) {
      enrollment.completedAt = new Date();
      if (study.completionBonusMinor > 0) {
        await this.payouts.createOwed(manager, {
          ...owedBase,
          stepCompletionId: null,
          kind: 'bonus',
          amountMinor: study.completionBonusMinor,
          payOverride: false,
        });
      }
    }
    await manager.save(enrollment);
    await this.audit.record(manager, {
      chain: studyId,
      actor,
      action: 'step.completed',
      subjectType: 'enrollment',
      subjectId: enrollment.id,
      data: {
        stepId,
        verifiedBy,
        payMinor: outcome.payMinor,
        payOverride: outcome.payOverride,
        completedStudy: outcome.remainingSteps === 0,
      },
    });
    return true;
  }

  /** Taking part, consent current, and the step's window open (or past due: late work still counts). */
  private async requireCanComplete(
    manager: EntityManager,
    studyId: string,
    enrollment: EnrollmentEntity,
    stepId: string,
  ): Promise<void> {
    if (!TAKING_PART.includes(enrollment.status)) {
      if (enrollment.status === 'completed')
        throw new StepRefusal('not-taking-part', 'Every step is already done.', 'enrollment');
      throw new StepRefusal(
        'not-taking-part',
        'Steps can be completed only while taking part in the study.',
        'enrollment',
      );
    }
    const active = await this.consent.activeVersion(studyId, manager);
    if (active && enrollment.signedVersionId !== active.id) {
      throw new StepRefusal(
        'consent',
        'The consent form has changed: please read and sign the new version before your next step.',
        'stepId',
        {
          currentVersion: { versionId: active.id, version: active.version, fingerprint: active.fingerprint },
        },
      );
    }
    const stepList = await this.steps.list(studyId, manager);
    const index = stepList.items.findIndex((s) => s.id === stepId);
    if (index < 0) throw new DomainException('NOT_FOUND', 'No such step in this study.');
    const done = new Map(
      (await this.steps.completionsOf(enrollment.id, manager)).map((c) => [c.stepId, c.completedAt]),
    );
    const window = this.windowsFor(enrollment, stepList, done)[index];
    const timing: StepTiming = window ? stepTiming(window, done.has(stepId), new Date()) : 'waiting';
    if (timing === 'upcoming')
      throw new StepRefusal('not-open', `This step opens on ${DATE.format(window!.opensAt!)}.`);
    if (timing === 'waiting') throw new StepRefusal('not-open', 'This step opens after the one before it is done.');
  }

  // ── codes and the record ──────────────────────────────────────────────────

  async codesOf(studyId: string, enrollmentId: string): Promise<StepCodesDto> {
    const enrollment = await this.dataSource.manager.findOne(EnrollmentEntity, {
      where: { id: enrollmentId, studyId },
    });
    if (!enrollment) throw new DomainException('NOT_FOUND', 'No such participant in this study.');
    return { reference: enrollment.reference, items: await this.steps.participantCodes(studyId, enrollmentId) };
  }

  /** Every randomized participant's codes, one row per person and step, for labs that hand codes out in person. */
  async codesCsv(studyId: string): Promise<string> {
    const enrollments = await this.dataSource.manager.find(EnrollmentEntity, {
      where: { studyId, status: In(['assigned', 'active', 'completed']) },
      order: { reference: 'ASC' },
    });
    const rows = await this.steps.participantCodesFor(studyId, enrollments);
    return stringify(
      rows.map((r) => [r.reference, r.position, r.title, r.code]),
      { header: true, columns: ['reference', 'step_position', 'step_title', 'code'] },
    );
  }

  /** Each step on the participant's record: window, status, the completion in force, undone ones, their own code. */
  async recordSteps(studyId: string, enrollment: EnrollmentEntity, now = new Date()): Promise<RecordStepDto[]> {
    const stepList = await this.steps.list(studyId);
    const history = await this.steps.completionHistoryOf(enrollment.id);
    const inForce = history.filter((c) => !c.undoneAt);
    const done = new Map(inForce.map((c) => [c.stepId, c.completedAt]));
    const windows = this.windowsFor(enrollment, stepList, done);
    const payoutStatus = await this.payouts.statusByCompletion(inForce.map((c) => c.id));
    const codes = new Map((await this.steps.participantCodes(studyId, enrollment.id)).map((c) => [c.stepId, c.code]));
    const emails = await this.emailsOf([
      ...new Set(history.flatMap((c) => [c.recordedBy, c.undoneBy]).filter((id): id is string => Boolean(id))),
    ]);
    const takingPart = TAKING_PART.includes(enrollment.status);
    return stepList.items.map((step, i) => {
      const completion = inForce.find((c) => c.stepId === step.id);
      const timing = windows[i] ? stepTiming(windows[i]!, Boolean(completion), now) : completion ? 'done' : 'waiting';
      const status = payoutStatus.get(completion?.id ?? '') ?? null;
      return {
        stepId: step.id,
        position: step.position,
        title: step.title,
        payMinor: step.payOverrides.find((o) => o.conditionId === enrollment.conditionId)?.payMinor ?? step.payMinor,
        verification: step.verification,
        status: timing === 'done' || takingPart ? timing : 'locked',
        opensAt: windows[i]?.opensAt?.toISOString() ?? null,
        dueAt: windows[i]?.dueAt?.toISOString() ?? null,
        completion: completion
          ? {
              id: completion.id,
              completedAt: completion.completedAt.toISOString(),
              verifiedBy: completion.verifiedBy,
              recordedByEmail: completion.recordedBy ? (emails.get(completion.recordedBy) ?? null) : null,
              evidence: completion.evidence,
              payoutStatus: status,
              canUndo: status === null || status === 'owed' || status === 'cancelled',
            }
          : null,
        undone: history
          .filter((c) => c.stepId === step.id && c.undoneAt)
          .map((c) => ({
            completedAt: c.completedAt.toISOString(),
            undoneAt: c.undoneAt!.toISOString(),
            reason: c.undoReason ?? '',
            undoneByEmail: c.undoneBy ? (emails.get(c.undoneBy) ?? null) : null,
          })),
        code: codes.get(step.id) ?? null,
      };
    });
  }

  private async emailsOf(userIds: string[]): Promise<Map<string, string>> {
    if (userIds.length === 0) return new Map();
    const rows: Array<{ id: string; email: string }> = await this.dataSource.query(
      `SELECT id, email FROM user_account WHERE id = ANY($1::uuid[])`,
      [userIds],
    );
    return new Map(rows.map((r) => [r.id, r.email]));
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
}
