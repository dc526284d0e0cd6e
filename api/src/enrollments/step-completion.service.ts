import { Injectable } from '@nestjs/common';
import { EntityManager } from 'typeorm';
import { AuditActor, AuditService } from '../audit';
import { DomainException } from '../common/errors/domain.exception';
import { EnrollmentException } from './enrollment.exception';
import { ConsentService } from '../consent';
import { PayoutsService } from '../payouts';
import { stepTiming, StepsService, type CompletionVerifiedBy, type StepTiming } from '../steps';
import { StudiesService } from '../studies';
import { windowsFor } from './enrollment-windows';
import { EnrollmentEntity } from './entities/enrollment.entity';

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
export class StepRefusal extends DomainException {
  constructor(
    readonly refusal: ReturnRefusal,
    message: string,
    field = 'stepId',
    details?: Record<string, unknown>,
  ) {
    // A changed consent form has its own code, so the portal can send the person to sign it without reading the text.
    super(
      refusal === 'consent' ? 'CONSENT_VERSION_STALE' : 'STEP_NOT_AVAILABLE',
      message,
      [{ field, message }],
      details,
    );
  }
}

/** One step completed inside the caller's transaction, with its checks and the pay it makes owed. */
@Injectable()
export class StepCompletionService {
  constructor(
    private readonly audit: AuditService,
    private readonly studies: StudiesService,
    private readonly steps: StepsService,
    private readonly consent: ConsentService,
    private readonly payouts: PayoutsService,
  ) {}

  /**
   * One completed step: recorded once, owed its pay (the same in every condition unless an override was recorded),
   * and the enrollment moves to active, or to completed with any completion bonus after the last step. Returns
   * false when the step was already done.
   */
  async completeStep(
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
  async requireCanComplete(
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
    if (index < 0) throw new EnrollmentException('NOT_FOUND', 'No such step in this study.');
    const done = new Map(
      (await this.steps.completionsOf(enrollment.id, manager)).map((c) => [c.stepId, c.completedAt]),
    );
    const window = windowsFor(enrollment, stepList, done)[index];
    const timing: StepTiming = window ? stepTiming(window, done.has(stepId), new Date()) : 'waiting';
    if (timing === 'upcoming')
      throw new StepRefusal('not-open', `This step opens on ${DATE.format(window!.opensAt!)}.`);
    if (timing === 'waiting') throw new StepRefusal('not-open', 'This step opens after the one before it is done.');
  }
}
