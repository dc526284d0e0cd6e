import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager } from 'typeorm';
import { AuditService } from '../audit/audit.service';
import type { SessionUser } from '../common/auth/session-user';
import { DomainException } from '../common/errors/domain.exception';
import { StudiesService } from '../studies/studies.service';
import { CreateStepDto, SetPayOverrideDto, StepDto, StepListDto, UpdateStepDto } from './dto/step.dto';
import { StepPayOverrideEntity } from './entities/step-pay-override.entity';
import { StepEntity } from './entities/step.entity';

@Injectable()
export class StepsService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly studies: StudiesService,
  ) {}

  async list(studyId: string, manager: EntityManager = this.dataSource.manager): Promise<StepListDto> {
    const study = await this.studies.require(studyId, manager);
    const steps = await manager.find(StepEntity, { where: { studyId }, order: { position: 'ASC' } });
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
