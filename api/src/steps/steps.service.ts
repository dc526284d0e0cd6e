import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { randomBytes, timingSafeEqual } from 'node:crypto';
import { DataSource, EntityManager, In, IsNull } from 'typeorm';
import { AuditService } from '../audit';
import type { SessionUser } from '../common/auth/session-user';
import { StepException } from './step.exception';
import { StudiesService } from '../studies';
import { AppConfig } from '../config/app-config';
import { queryRows } from '../database/raw-query';
import {
  CreateStepDto,
  ReturnLinkSetupDto,
  SetPayOverrideDto,
  StepDto,
  StepListDto,
  StepSettingsDto,
  UpdateStepDto,
} from './dto/step.dto';
import { StudyStepKeyEntity } from './entities/study-step-key.entity';
import { participantCode, participantCodeMatches } from './participant-code';
import { signReturnToken, verifyReturnToken, type ReturnKeyRing, type ReturnTokenCheck } from './return-link';
import { addDays, type CompletionVerifiedBy, type StepSchedule } from './step-window';
import { StepPayOverrideEntity } from './entities/step-pay-override.entity';
import { StepEntity } from './entities/step.entity';
import { StepCompletionEntity } from './entities/step-completion.entity';
import { completionCodeHash } from './completion-code';

@Injectable()
export class StepsService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly studies: StudiesService,
    private readonly config: AppConfig,
  ) {
    this.studies.addOpeningRequirement({
      key: 'steps',
      label: 'At least one paid step',
      order: 3,
      check: async (manager, studyId) =>
        (await manager.count(StepEntity, { where: { studyId } })) > 0 ? null : 'add at least one step',
    });
  }

  async list(studyId: string, manager: EntityManager = this.dataSource.manager): Promise<StepListDto> {
    const study = await this.studies.require(studyId, manager);
    const steps = await manager
      .createQueryBuilder(StepEntity, 'step')
      .addSelect('step.completionCodeHash')
      .where('step.study_id = :studyId', { studyId })
      .orderBy('step.position', 'ASC')
      .getMany();
    const overrides = steps.length
      ? await manager
          .createQueryBuilder(StepPayOverrideEntity, 'o')
          .where('o.step_id IN (:...ids)', { ids: steps.map((s) => s.id) })
          .getMany()
      : [];
    const items: StepDto[] = steps.map((step) => ({
      id: step.id,
      position: step.position,
      title: step.title,
      description: step.description,
      payMinor: step.payMinor,
      hasCompletionCode: Boolean(step.completionCodeHash),
      verification: step.verification,
      taskUrl: step.taskUrl,
      opensAfterDays: step.opensAfterDays,
      opensFrom: step.opensFrom,
      dueWithinDays: step.dueWithinDays,
      payOverrides: overrides
        .filter((o) => o.stepId === step.id)
        .map((o) => ({
          conditionId: o.conditionId,
          payMinor: o.payMinor,
          reason: o.reason,
          recordedAt: o.recordedAt.toISOString(),
        })),
    }));
    return {
      items,
      currency: study.currency,
      totalPayMinor: items.reduce((sum, s) => sum + s.payMinor, 0),
      hasPayOverrides: overrides.length > 0,
    };
  }

  async create(actor: SessionUser, studyId: string, input: CreateStepDto): Promise<StepListDto> {
    return this.dataSource.transaction(async (manager) => {
      await this.requireChangeable(manager, studyId);
      const [{ max }] = await manager.query(`SELECT coalesce(max(position), 0) AS max FROM step WHERE study_id = $1`, [
        studyId,
      ]);
      const last = Number(max);
      const position = Math.min(input.position ?? last + 1, last + 1);
      // Make room: park later steps far out of range, then bring them back one place down, so the unique
      // (study, position) index never sees two steps at once in the same place.
      if (position <= last) {
        await manager.query(`UPDATE step SET position = position + 1000000 WHERE study_id = $1 AND position >= $2`, [
          studyId,
          position,
        ]);
        await manager.query(`UPDATE step SET position = position - 999999 WHERE study_id = $1 AND position > 1000000`, [
          studyId,
        ]);
      }
      const step = await manager.save(
        manager.create(StepEntity, {
          studyId,
          position,
          title: input.title,
          description: input.description ?? '',
          payMinor: input.payMinor,
        }),
      );
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'step.created',
        subjectType: 'step',
        subjectId: step.id,
        data: { title: step.title, position, payMinor: step.payMinor },
      });
      return this.list(studyId, manager);
    });
  }

  async update(actor: SessionUser, studyId: string, stepId: string, input: UpdateStepDto): Promise<StepListDto> {
    return this.dataSource.transaction(async (manager) => {
      await this.requireChangeable(manager, studyId);
      const step = await this.requireStep(manager, studyId, stepId);
      const changes = Object.fromEntries(
        Object.entries(input).filter(([k, v]) => v !== undefined && (step as never)[k] !== v),
      );
      if (Object.keys(changes).length > 0) {
        await manager.update(StepEntity, { id: stepId }, changes);
        await this.audit.record(manager, {
          chain: studyId,
          actor,
          action: 'step.updated',
          subjectType: 'step',
          subjectId: stepId,
          data: { changes },
        });
      }
      return this.list(studyId, manager);
    });
  }

  /** Records a deliberate exception to equal pay for one condition; it is flagged wherever pay is shown. */
  async setPayOverride(
    actor: SessionUser,
    studyId: string,
    stepId: string,
    conditionId: string,
    input: SetPayOverrideDto,
  ): Promise<StepListDto> {
    return this.dataSource.transaction(async (manager) => {
      await this.requireChangeable(manager, studyId);
      await this.requireStep(manager, studyId, stepId);
      if (!(await this.studies.hasCondition(studyId, conditionId, manager)))
        throw new StepException('NOT_FOUND', 'No such condition in this study.', [
          { field: 'conditionId', message: 'is not a condition of this study' },
        ]);
      await manager.query(
        `INSERT INTO step_pay_override (step_id, condition_id, pay_minor, reason, recorded_by) VALUES ($1, $2, $3, $4, $5)
         ON CONFLICT (step_id, condition_id) DO UPDATE SET pay_minor = EXCLUDED.pay_minor, reason = EXCLUDED.reason,
           recorded_by = EXCLUDED.recorded_by, recorded_at = now()`,
        [stepId, conditionId, input.payMinor, input.reason, actor.id],
      );
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'step.pay-override-recorded',
        subjectType: 'step',
        subjectId: stepId,
        data: { conditionId, payMinor: input.payMinor, reason: input.reason },
      });
      return this.list(studyId, manager);
    });
  }

  async removePayOverride(
    actor: SessionUser,
    studyId: string,
    stepId: string,
    conditionId: string,
  ): Promise<StepListDto> {
    return this.dataSource.transaction(async (manager) => {
      await this.requireChangeable(manager, studyId);
      await this.requireStep(manager, studyId, stepId);
      const result = await manager.delete(StepPayOverrideEntity, { stepId, conditionId });
      if (result.affected) {
        await this.audit.record(manager, {
          chain: studyId,
          actor,
          action: 'step.pay-override-removed',
          subjectType: 'step',
          subjectId: stepId,
          data: { conditionId },
        });
      }
      return this.list(studyId, manager);
    });
  }

  /** Sets the code shown to participants at the end of the step's external task; only its hash is kept. */
  async setCompletionCode(actor: SessionUser, studyId: string, stepId: string, code: string): Promise<StepListDto> {
    return this.dataSource.transaction(async (manager) => {
      await this.requireChangeable(manager, studyId);
      await this.requireStep(manager, studyId, stepId);
      await manager.update(
        StepEntity,
        { id: stepId },
        { completionCodeHash: completionCodeHash(stepId, code), verification: 'shared-code' },
      );
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'step.completion-code-set',
        subjectType: 'step',
        subjectId: stepId,
        data: {},
      });
      return this.list(studyId, manager);
    });
  }

  /**
   * Checks a typed code: the participant's own code on a per-participant-code step, the step's one code on a
   * shared-code step. Which kind matched is returned so the completion records it.
   */
  async checkCode(
    studyId: string,
    stepId: string,
    enrollmentId: string,
    code: string,
  ): Promise<{ matched: boolean; verifiedBy: 'participant-code' | 'shared-code' }> {
    const step = await this.dataSource
      .createQueryBuilder(StepEntity, 'step')
      .addSelect('step.completionCodeHash')
      .where('step.id = :stepId AND step.study_id = :studyId', { stepId, studyId })
      .getOne();
    if (!step) throw new StepException('NOT_FOUND', 'No such step in this study.');
    if (step.verification === 'participant-code') {
      const key = Buffer.from((await this.keysOf(studyId)).codeKey, 'base64');
      return { matched: participantCodeMatches(key, enrollmentId, stepId, code), verifiedBy: 'participant-code' };
    }
    if (step.verification !== 'shared-code' || !step.completionCodeHash) {
      throw new StepException(
        'STEP_TAKES_NO_CODE',
        step.verification === 'return-link'
          ? 'This step is finished in its task: use the task button, and you will be brought back.'
          : 'This step has no completion code; the research team will check it off for you.',
      );
    }
    const given = Buffer.from(completionCodeHash(stepId, code), 'hex');
    return { matched: timingSafeEqual(given, Buffer.from(step.completionCodeHash, 'hex')), verifiedBy: 'shared-code' };
  }

  async requireStepOf(
    studyId: string,
    stepId: string,
    manager: EntityManager = this.dataSource.manager,
  ): Promise<StepEntity> {
    return this.requireStep(manager, studyId, stepId);
  }

  /**
   * Records a step as done for an enrollment; a second call for the same step returns the first completion.
   * `payMinor` is what this step pays in the person's condition, with `payOverride` when a recorded exception applies.
   */
  async recordCompletion(
    manager: EntityManager,
    input: {
      studyId: string;
      enrollmentId: string;
      stepId: string;
      conditionId: string | null;
      verifiedBy: CompletionVerifiedBy;
      recordedBy: string | null;
      evidence?: Record<string, unknown>;
    },
  ): Promise<{
    completion: StepCompletionEntity;
    created: boolean;
    payMinor: number;
    payOverride: boolean;
    remainingSteps: number;
  }> {
    const step = await this.requireStep(manager, input.studyId, input.stepId);
    const inserted = await manager
      .createQueryBuilder()
      .insert()
      .into(StepCompletionEntity)
      .values({
        enrollmentId: input.enrollmentId,
        stepId: input.stepId,
        verifiedBy: input.verifiedBy,
        recordedBy: input.recordedBy,
        evidence: (input.evidence ?? {}) as never,
      })
      .orIgnore()
      .returning('id')
      .execute();
    const completion = await manager.findOneOrFail(StepCompletionEntity, {
      where: { enrollmentId: input.enrollmentId, stepId: input.stepId, undoneAt: IsNull() },
    });
    const override = input.conditionId
      ? await manager.findOne(StepPayOverrideEntity, {
          where: { stepId: input.stepId, conditionId: input.conditionId },
        })
      : null;
    const [{ remaining }] = await manager.query(
      `SELECT count(*) AS remaining FROM step s WHERE s.study_id = $1
         AND NOT EXISTS (SELECT 1 FROM step_completion c WHERE c.step_id = s.id AND c.enrollment_id = $2 AND c.undone_at IS NULL)`,
      [input.studyId, input.enrollmentId],
    );
    return {
      completion,
      created: inserted.identifiers.length > 0 && Boolean(inserted.identifiers[0]),
      payMinor: override?.payMinor ?? step.payMinor,
      payOverride: Boolean(override),
      remainingSteps: Number(remaining),
    };
  }

  /** Completions in force (not undone), oldest first. */
  completionsOf(
    enrollmentId: string,
    manager: EntityManager = this.dataSource.manager,
  ): Promise<StepCompletionEntity[]> {
    return manager.find(StepCompletionEntity, {
      where: { enrollmentId, undoneAt: IsNull() },
      order: { completedAt: 'ASC' },
    });
  }

  /** Every completion, undone ones included, for the participant's record. */
  completionHistoryOf(
    enrollmentId: string,
    manager: EntityManager = this.dataSource.manager,
  ): Promise<StepCompletionEntity[]> {
    return manager.find(StepCompletionEntity, { where: { enrollmentId }, order: { completedAt: 'ASC' } });
  }

  /** Completions in force for many enrollments at once: step id → completion time per enrollment. */
  async completionTimesOf(
    enrollmentIds: string[],
    manager: EntityManager = this.dataSource.manager,
  ): Promise<Map<string, Map<string, Date>>> {
    const byEnrollment = new Map<string, Map<string, Date>>(enrollmentIds.map((id) => [id, new Map()]));
    if (enrollmentIds.length === 0) return byEnrollment;
    const rows = await manager.find(StepCompletionEntity, {
      where: { enrollmentId: In(enrollmentIds), undoneAt: IsNull() },
    });
    for (const row of rows) byEnrollment.get(row.enrollmentId)?.set(row.stepId, row.completedAt);
    return byEnrollment;
  }

  /** Step windows' inputs in step order. */
  async schedulesOf(
    studyId: string,
    manager: EntityManager = this.dataSource.manager,
  ): Promise<Array<StepSchedule & { title: string; position: number }>> {
    const steps = await manager.find(StepEntity, { where: { studyId }, order: { position: 'ASC' } });
    return steps.map((s) => ({
      id: s.id,
      title: s.title,
      position: s.position,
      opensAfterDays: s.opensAfterDays,
      opensFrom: s.opensFrom,
      dueWithinDays: s.dueWithinDays,
    }));
  }

  /**
   * Undoes a completion in force, keeping it as history with who undid it and why. The caller cancels its payout
   * first (refused once approved) inside the same transaction.
   */
  async undoCompletion(
    manager: EntityManager,
    input: { enrollmentId: string; stepId: string; undoneBy: string; reason: string },
  ): Promise<StepCompletionEntity> {
    const completion = await manager.findOne(StepCompletionEntity, {
      where: { enrollmentId: input.enrollmentId, stepId: input.stepId, undoneAt: IsNull() },
      lock: { mode: 'pessimistic_write' },
    });
    if (!completion) throw new StepException('NOT_FOUND', 'This step is not marked done for this participant.');
    completion.undoneAt = new Date();
    completion.undoneBy = input.undoneBy;
    completion.undoReason = input.reason;
    return manager.save(completion);
  }

  // ── how completions are verified ──────────────────────────────────────────

  /** How a step is verified and when it can be done; a shared code can be set in the same call. */
  async saveSettings(
    actor: SessionUser,
    studyId: string,
    stepId: string,
    input: StepSettingsDto,
  ): Promise<StepListDto> {
    return this.dataSource.transaction(async (manager) => {
      await this.requireChangeable(manager, studyId);
      const step = await manager
        .createQueryBuilder(StepEntity, 'step')
        .addSelect('step.completionCodeHash')
        .where('step.id = :stepId AND step.study_id = :studyId', { stepId, studyId })
        .getOne();
      if (!step) throw new StepException('NOT_FOUND', 'No such step in this study.');
      const taskUrl = input.taskUrl?.trim() || null;
      if (input.verification === 'return-link' && !taskUrl) {
        throw new StepException('VALIDATION_FAILED', 'A return-link step needs the address of the external task.', [
          { field: 'taskUrl', message: 'is required for a return link' },
        ]);
      }
      if (input.verification === 'shared-code' && !input.sharedCode && !step.completionCodeHash) {
        throw new StepException('VALIDATION_FAILED', 'Set the code everyone will type for this step.', [
          { field: 'sharedCode', message: 'is required for one code for the whole step' },
        ]);
      }
      const changes: Partial<StepEntity> = {
        verification: input.verification,
        taskUrl,
        opensAfterDays: input.opensAfterDays,
        opensFrom: input.opensFrom,
        dueWithinDays: input.dueWithinDays ?? null,
      };
      if (input.sharedCode) changes.completionCodeHash = completionCodeHash(stepId, input.sharedCode);
      await manager.update(StepEntity, { id: stepId }, changes);
      const { completionCodeHash: _hash, ...recorded } = changes;
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'step.verification-set',
        subjectType: 'step',
        subjectId: stepId,
        data: { ...recorded, sharedCodeChanged: Boolean(input.sharedCode) },
      });
      return this.list(studyId, manager);
    });
  }

  /** The study's step keys, made on first use. */
  private async keysOf(studyId: string, manager: EntityManager = this.dataSource.manager): Promise<StudyStepKeyEntity> {
    const read = () =>
      manager
        .createQueryBuilder(StudyStepKeyEntity, 'k')
        .addSelect(['k.codeKey', 'k.returnKey', 'k.previousReturnKey'])
        .where('k.study_id = :studyId', { studyId })
        .getOne();
    const existing = await read();
    if (existing) return existing;
    await manager.query(
      `INSERT INTO study_step_key (study_id, code_key, return_key) VALUES ($1, $2, $3) ON CONFLICT (study_id) DO NOTHING`,
      [studyId, randomBytes(32).toString('base64'), randomBytes(32).toString('base64')],
    );
    return (await read())!;
  }

  private keyRing(keys: StudyStepKeyEntity): ReturnKeyRing {
    return {
      current: { id: keys.returnKeyId, secret: Buffer.from(keys.returnKey, 'base64') },
      previous:
        keys.previousReturnKey && keys.returnKeyRotatedAt
          ? {
              id: keys.returnKeyId - 1,
              secret: Buffer.from(keys.previousReturnKey, 'base64'),
              acceptUntil: addDays(keys.returnKeyRotatedAt, this.config.returnLinkGraceDays),
            }
          : null,
    };
  }

  async returnLinkSetup(studyId: string): Promise<ReturnLinkSetupDto> {
    const keys = await this.keysOf(studyId);
    return {
      returnAddressTemplate: `${this.returnBase()}{token}`,
      parameters: [
        {
          name: 'ref',
          meaning:
            "The participant's pseudonymous reference (for example P-7KQ2MX); store it with their answers instead of any name or e-mail.",
        },
        {
          name: 'token',
          meaning:
            'The signed return token. At the end of the task, send the participant to the return address with this value in place of {token}.',
        },
        {
          name: 'return',
          meaning:
            'The whole return address, already filled in. If your tool can redirect to a value it received, redirect to this one.',
        },
        {
          name: 'code',
          meaning:
            "Only for steps with per-participant codes: this participant's code, if your task shows it at the end.",
        },
      ],
      keyId: keys.returnKeyId,
      rotatedAt: keys.returnKeyRotatedAt?.toISOString() ?? null,
      graceDays: this.config.returnLinkGraceDays,
      validDays: this.config.returnLinkValidDays,
    };
  }

  /** New return links are signed with a fresh key; links already handed out keep working for the grace period. */
  async rotateReturnKey(actor: SessionUser, studyId: string): Promise<ReturnLinkSetupDto> {
    await this.dataSource.transaction(async (manager) => {
      await this.requireChangeable(manager, studyId);
      await this.keysOf(studyId, manager);
      const [row] = await queryRows<{ return_key_id: number }>(
        manager,
        `UPDATE study_step_key SET previous_return_key = return_key, return_key = $2, return_key_id = return_key_id + 1, return_key_rotated_at = now()
         WHERE study_id = $1 RETURNING return_key_id`,
        [studyId, randomBytes(32).toString('base64')],
      );
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'step.return-key-rotated',
        subjectType: 'study',
        subjectId: studyId,
        data: { keyId: row.return_key_id },
      });
    });
    return this.returnLinkSetup(studyId);
  }

  private returnBase(): string {
    return new URL('/api/return/', this.config.portalUrl).toString();
  }

  /** The external task's address with the reference, the signed return address and (for code steps) the code. */
  async taskAddress(input: {
    studyId: string;
    stepId: string;
    enrollmentId: string;
    reference: string;
    dueAt: Date | null;
    now: Date;
  }): Promise<string> {
    const step = await this.requireStep(this.dataSource.manager, input.studyId, input.stepId);
    if (!step.taskUrl) throw new StepException('STEP_HAS_NO_TASK', 'This step is not done in an external task.');
    const keys = await this.keysOf(input.studyId);
    const validFrom = input.dueAt && input.dueAt > input.now ? input.dueAt : input.now;
    const token = signReturnToken(
      {
        studyId: input.studyId,
        reference: input.reference,
        stepId: step.id,
        expiresAt: addDays(validFrom, this.config.returnLinkValidDays),
      },
      this.keyRing(keys).current,
    );
    const url = new URL(step.taskUrl);
    url.searchParams.set('ref', input.reference);
    url.searchParams.set('token', token);
    url.searchParams.set('return', `${this.returnBase()}${token}`);
    if (step.verification === 'participant-code')
      url.searchParams.set('code', participantCode(Buffer.from(keys.codeKey, 'base64'), input.enrollmentId, step.id));
    return url.toString();
  }

  /** Checks a return token against its study's keys; an unknown study reads as forged. */
  async checkReturnToken(studyId: string, token: string, now: Date): Promise<ReturnTokenCheck> {
    if (!(await this.studies.exists(studyId))) return { ok: false, reason: 'forged' };
    return verifyReturnToken(token, this.keyRing(await this.keysOf(studyId)), now);
  }

  /** This participant's own code for each per-participant-code step. */
  async participantCodes(
    studyId: string,
    enrollmentId: string,
  ): Promise<Array<{ stepId: string; position: number; title: string; code: string }>> {
    const steps = await this.dataSource.manager.find(StepEntity, {
      where: { studyId, verification: 'participant-code' },
      order: { position: 'ASC' },
    });
    if (steps.length === 0) return [];
    const key = Buffer.from((await this.keysOf(studyId)).codeKey, 'base64');
    return steps.map((s) => ({
      stepId: s.id,
      position: s.position,
      title: s.title,
      code: participantCode(key, enrollmentId, s.id),
    }));
  }

  /** Codes for many enrollments, for the lab's printed lists. */
  async participantCodesFor(studyId: string, enrollments: Array<{ id: string; reference: string }>) {
    const steps = await this.dataSource.manager.find(StepEntity, {
      where: { studyId, verification: 'participant-code' },
      order: { position: 'ASC' },
    });
    const key = Buffer.from((await this.keysOf(studyId)).codeKey, 'base64');
    return enrollments.flatMap((e) =>
      steps.map((s) => ({
        reference: e.reference,
        position: s.position,
        title: s.title,
        code: participantCode(key, e.id, s.id),
      })),
    );
  }

  private async requireChangeable(manager: EntityManager, studyId: string): Promise<void> {
    const study = await this.studies.require(studyId, manager, true);
    if (study.status === 'closed')
      throw new StepException('STUDY_SEALED', 'A closed study is sealed and cannot change.');
  }

  private async requireStep(manager: EntityManager, studyId: string, stepId: string): Promise<StepEntity> {
    const step = await manager.findOne(StepEntity, { where: { id: stepId, studyId } });
    if (!step) throw new StepException('NOT_FOUND', 'No such step in this study.');
    return step;
  }
}
