import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { timingSafeEqual } from 'node:crypto';
import { DataSource, EntityManager } from 'typeorm';
import { AuditService } from '../audit/audit.service';
import type { SessionUser } from '../common/auth/session-user';
import { DomainException } from '../common/errors/domain.exception';
import { StudiesService } from '../studies/studies.service';
import { CreateStepDto, SetPayOverrideDto, StepDto, StepListDto, UpdateStepDto } from './dto/step.dto';
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
  ) {}

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
      payOverrides: overrides
        .filter((o) => o.stepId === step.id)
        .map((o) => ({ conditionId: o.conditionId, payMinor: o.payMinor, reason: o.reason, recordedAt: o.recordedAt.toISOString() })),
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
      const [{ max }] = await manager.query(`SELECT coalesce(max(position), 0) AS max FROM step WHERE study_id = $1`, [studyId]);
      const last = Number(max);
      const position = Math.min(input.position ?? last + 1, last + 1);
      // Make room: park later steps far out of range, then bring them back one place down, so the unique
      // (study, position) index never sees two steps at once in the same place.
      if (position <= last) {
        await manager.query(`UPDATE step SET position = position + 1000000 WHERE study_id = $1 AND position >= $2`, [studyId, position]);
        await manager.query(`UPDATE step SET position = position - 999999 WHERE study_id = $1 AND position > 1000000`, [studyId]);
      }
      const step = await manager.save(
        manager.create(StepEntity, { studyId, position, title: input.title, description: input.description ?? '', payMinor: input.payMinor }),
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
      const changes = Object.fromEntries(Object.entries(input).filter(([k, v]) => v !== undefined && (step as never)[k] !== v));
      if (Object.keys(changes).length > 0) {
        await manager.update(StepEntity, { id: stepId }, changes);
        await this.audit.record(manager, { chain: studyId, actor, action: 'step.updated', subjectType: 'step', subjectId: stepId, data: { changes } });
      }
      return this.list(studyId, manager);
    });
  }

  /** Records a deliberate exception to equal pay for one condition; it is flagged wherever pay is shown. */
  async setPayOverride(actor: SessionUser, studyId: string, stepId: string, conditionId: string, input: SetPayOverrideDto): Promise<StepListDto> {
    return this.dataSource.transaction(async (manager) => {
      await this.requireChangeable(manager, studyId);
      await this.requireStep(manager, studyId, stepId);
      if (!(await this.studies.hasCondition(studyId, conditionId, manager))) throw new DomainException('NOT_FOUND', 'No such condition in this study.', [{ field: 'conditionId', message: 'is not a condition of this study' }]);
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

  async removePayOverride(actor: SessionUser, studyId: string, stepId: string, conditionId: string): Promise<StepListDto> {
    return this.dataSource.transaction(async (manager) => {
      await this.requireChangeable(manager, studyId);
      await this.requireStep(manager, studyId, stepId);
      const result = await manager.delete(StepPayOverrideEntity, { stepId, conditionId });
      if (result.affected) {
        await this.audit.record(manager, { chain: studyId, actor, action: 'step.pay-override-removed', subjectType: 'step', subjectId: stepId, data: { conditionId } });
      }
      return this.list(studyId, manager);
    });
  }

  /** Sets the code shown to participants at the end of the step's external task; only its hash is kept. */
  async setCompletionCode(actor: SessionUser, studyId: string, stepId: string, code: string): Promise<StepListDto> {
    return this.dataSource.transaction(async (manager) => {
      await this.requireChangeable(manager, studyId);
      await this.requireStep(manager, studyId, stepId);
      await manager.update(StepEntity, { id: stepId }, { completionCodeHash: completionCodeHash(stepId, code) });
      await this.audit.record(manager, { chain: studyId, actor, action: 'step.completion-code-set', subjectType: 'step', subjectId: stepId, data: {} });
      return this.list(studyId, manager);
    });
  }

  /** True when the code matches the step's; compared as hashes in constant time. */
  async codeMatches(studyId: string, stepId: string, code: string): Promise<boolean> {
    const step = await this.dataSource
      .createQueryBuilder(StepEntity, 'step')
      .addSelect('step.completionCodeHash')
      .where('step.id = :stepId AND step.study_id = :studyId', { stepId, studyId })
      .getOne();
    if (!step) throw new DomainException('NOT_FOUND', 'No such step in this study.');
    if (!step.completionCodeHash) {
      throw new DomainException('CONFLICT', 'This step has no completion code; the research team will check it off for you.');
    }
    const given = Buffer.from(completionCodeHash(stepId, code), 'hex');
    return timingSafeEqual(given, Buffer.from(step.completionCodeHash, 'hex'));
  }

  /**
   * Records a step as done for an enrollment; a second call for the same step returns the first completion.
   * `payMinor` is what this step pays in the person's condition, with `payOverride` when a recorded exception applies.
   */
  async recordCompletion(
    manager: EntityManager,
    input: { studyId: string; enrollmentId: string; stepId: string; conditionId: string | null; verifiedBy: 'code' | 'staff'; recordedBy: string | null },
  ): Promise<{ completion: StepCompletionEntity; created: boolean; payMinor: number; payOverride: boolean; remainingSteps: number }> {
    const step = await this.requireStep(manager, input.studyId, input.stepId);
    const inserted = await manager
      .createQueryBuilder()
      .insert()
      .into(StepCompletionEntity)
      .values({ enrollmentId: input.enrollmentId, stepId: input.stepId, verifiedBy: input.verifiedBy, recordedBy: input.recordedBy })
      .orIgnore()
      .returning('id')
      .execute();
    const completion = await manager.findOneOrFail(StepCompletionEntity, { where: { enrollmentId: input.enrollmentId, stepId: input.stepId } });
    const override = input.conditionId
      ? await manager.findOne(StepPayOverrideEntity, { where: { stepId: input.stepId, conditionId: input.conditionId } })
      : null;
    const [{ remaining }] = await manager.query(
      `SELECT count(*) AS remaining FROM step s WHERE s.study_id = $1
         AND NOT EXISTS (SELECT 1 FROM step_completion c WHERE c.step_id = s.id AND c.enrollment_id = $2)`,
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

  completionsOf(enrollmentId: string, manager: EntityManager = this.dataSource.manager): Promise<StepCompletionEntity[]> {
    return manager.find(StepCompletionEntity, { where: { enrollmentId }, order: { completedAt: 'ASC' } });
  }

  private async requireChangeable(manager: EntityManager, studyId: string): Promise<void> {
    const study = await this.studies.require(studyId, manager, true);
    if (study.status === 'closed') throw new DomainException('CONFLICT', 'A closed study is sealed and cannot change.');
  }

  private async requireStep(manager: EntityManager, studyId: string, stepId: string): Promise<StepEntity> {
    const step = await manager.findOne(StepEntity, { where: { id: stepId, studyId } });
    if (!step) throw new DomainException('NOT_FOUND', 'No such step in this study.');
    return step;
  }
}
