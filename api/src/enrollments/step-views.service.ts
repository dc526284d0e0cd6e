import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { stringify } from 'csv-stringify/sync';
import { DataSource, In } from 'typeorm';
import { EnrollmentException } from './enrollment.exception';
import { PayoutsService } from '../payouts';
import { AccountEmailsReadModel } from '../reporting';
import { StepListDto, stepTiming, StepsService } from '../steps';
import { MyStepDto, RecordStepDto, StepCodesDto } from './dto/enrollment.dto';
import { windowsFor } from './enrollment-windows';
import { EnrollmentEntity } from './entities/enrollment.entity';

const TAKING_PART = ['assigned', 'active'];

/** Steps as people read them: the participant's own list, the staff record of each step, and the step codes. */
@Injectable()
export class StepViewsService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly steps: StepsService,
    private readonly payouts: PayoutsService,
    private readonly accountEmails: AccountEmailsReadModel,
  ) {}

  /** Each step with its window and status for the participant's own view. */
  async participantSteps(
    enrollment: EnrollmentEntity,
    stepList: StepListDto,
    needsSignature: boolean,
    now = new Date(),
  ): Promise<MyStepDto[]> {
    const completions = await this.steps.completionsOf(enrollment.id);
    const done = new Map(completions.map((c) => [c.stepId, c.completedAt]));
    const windows = windowsFor(enrollment, stepList, done);
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

  async codesOf(studyId: string, enrollmentId: string): Promise<StepCodesDto> {
    const enrollment = await this.dataSource.manager.findOne(EnrollmentEntity, {
      where: { id: enrollmentId, studyId },
    });
    if (!enrollment) throw new EnrollmentException('NOT_FOUND', 'No such participant in this study.');
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
    const windows = windowsFor(enrollment, stepList, done);
    const payoutStatus = await this.payouts.statusByCompletion(inForce.map((c) => c.id));
    const codes = new Map((await this.steps.participantCodes(studyId, enrollment.id)).map((c) => [c.stepId, c.code]));
    const emails = await this.accountEmails.of([
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
}
