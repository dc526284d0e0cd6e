import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, In } from 'typeorm';
import { AuditActor, AuditService } from '../audit';
import type { SessionUser } from '../common/auth/session-user';
import { DomainException } from '../common/errors/domain.exception';
import { PayoutsService } from '../payouts';
import { PostgresThrottlerStorage } from '../rate-limit/postgres-throttler.storage';
import { BulkCompletionResultDto, BulkCompletionRowDto } from '../steps';
import { readReturnToken, StepsService } from '../steps';
import { StudiesService } from '../studies';
import { StepStartDto } from './dto/enrollment.dto';
import { EnrollmentException } from './enrollment.exception';
import { requireMine, requireOnRoster } from './enrollment-lookup';
import { windowsFor } from './enrollment-windows';
import { EnrollmentEntity } from './entities/enrollment.entity';
import { ReturnOutcome, ReturnRefusal, StepCompletionService, StepRefusal } from './step-completion.service';

/** Wrong completion codes allowed per enrollment per 15 minutes. */
const WRONG_CODE_LIMIT = 5;
const WRONG_CODE_WINDOW_MS = 15 * 60 * 1000;

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
    private readonly payouts: PayoutsService,
    private readonly completion: StepCompletionService,
  ) {}

  /** The external task's address, with the reference and a return address signed for this person and step. */
  async startTask(user: SessionUser, studyId: string, stepId: string): Promise<StepStartDto> {
    const enrollment = await requireMine(this.dataSource.manager, user, studyId);
    await this.completion.requireCanComplete(this.dataSource.manager, studyId, enrollment, stepId);
    const stepList = await this.steps.list(studyId);
    const step = stepList.items.find((s) => s.id === stepId)!;
    if (!step.taskUrl || !['return-link', 'participant-code'].includes(step.verification)) {
      throw new EnrollmentException('STEP_HAS_NO_TASK', 'This step is not done in an external task.', [
        { field: 'stepId', message: 'has no external task' },
      ]);
    }
    const done = new Map((await this.steps.completionsOf(enrollment.id)).map((c) => [c.stepId, c.completedAt]));
    const window = windowsFor(enrollment, stepList, done)[stepList.items.indexOf(step)];
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
        return this.completion.completeStep(manager, actor, study.id, locked, check.claim.stepId, 'return-link', {
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
    const enrollment = await requireMine(this.dataSource.manager, user, studyId);
    const limiterKey = `wrong-code:${enrollment.id}`;
    // Only wrong codes count, so the same window store as sign-in is used directly rather than as a route guard.
    const limiter = new PostgresThrottlerStorage(this.dataSource);
    if ((await limiter.hitsInWindow(limiterKey)) >= WRONG_CODE_LIMIT) {
      throw new EnrollmentException(
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
      throw new EnrollmentException('VALIDATION_FAILED', 'That code does not match this step.', [
        { field: 'code', message: 'does not match; check it and try again' },
      ]);
    }
    await this.dataSource.transaction(async (manager) => {
      const locked = await requireMine(manager, user, studyId, true);
      await this.completion.completeStep(manager, user, studyId, locked, stepId, verifiedBy, {});
    });
  }

  async completeByStaff(actor: SessionUser, studyId: string, enrollmentId: string, stepId: string): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const enrollment = await requireOnRoster(manager, studyId, enrollmentId);
      await this.completion.completeStep(manager, actor, studyId, enrollment, stepId, 'staff', {});
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
            return this.completion.completeStep(manager, actor, studyId, locked, stepId, 'staff-list', { line: i + 1 });
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
      const enrollment = await requireOnRoster(manager, studyId, enrollmentId);
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
}
