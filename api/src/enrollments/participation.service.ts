import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import { AuditService } from '../audit';
import type { SessionUser } from '../common/auth/session-user';
import { ConsentService } from '../consent';
import { PayoutsService } from '../payouts';
import { StepsService } from '../steps';
import { StudiesService, StudyEntity } from '../studies';
import { MyEnrollmentDto, ScreeningResultDto } from './dto/enrollment.dto';
import { EnrollmentException } from './enrollment.exception';
import { CLOSED_STATUSES, insertEnrollment, requireMine } from './enrollment-lookup';
import { EnrollmentEntity } from './entities/enrollment.entity';
import { evaluateScreening, screeningProblemMessage } from './screening-rules';
import { StepViewsService } from './step-views.service';

/** What a caller already read in this request, so the participant's view does not read it again. */
export interface KnownForView {
  study?: StudyEntity;
  activeVersionId?: string | null;
  lastSignedAt?: Date | null;
}

/** The participant's own enrollment: joining, screening, what they see next, and their signed copy. */
@Injectable()
export class ParticipationService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly studies: StudiesService,
    private readonly steps: StepsService,
    private readonly consent: ConsentService,
    private readonly payouts: PayoutsService,
    private readonly stepViews: StepViewsService,
  ) {}

  async join(user: SessionUser, studyId: string): Promise<{ created: boolean; enrollment: MyEnrollmentDto }> {
    if (user.role !== 'participant')
      throw new EnrollmentException('FORBIDDEN', 'Staff accounts cannot take part in studies.');
    const created = await this.dataSource.transaction(async (manager) => {
      const study = await this.studies.require(studyId, manager);
      const existing = await manager.findOne(EnrollmentEntity, { where: { studyId, participantId: user.id } });
      if (existing) return false;
      if (study.status !== 'recruiting')
        throw new EnrollmentException('STUDY_NOT_RECRUITING', 'This study is not taking new participants right now.');
      const enrollment = await insertEnrollment(manager, studyId, user.id, { invitedAt: new Date() });
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

  async me(user: SessionUser, studyId: string): Promise<MyEnrollmentDto> {
    const enrollment = await requireMine(this.dataSource.manager, user, studyId);
    return this.myView(enrollment);
  }

  /** Everything the participant's study page shows about their enrollment. */
  async myView(enrollment: EnrollmentEntity, known: KnownForView = {}): Promise<MyEnrollmentDto> {
    const [study, questions, stepList, activeVersionId, lastSignedAt, conditions, earned] = await Promise.all([
      known.study ?? this.studies.require(enrollment.studyId),
      this.studies.screeningQuestions(enrollment.studyId),
      this.steps.list(enrollment.studyId),
      known.activeVersionId !== undefined
        ? known.activeVersionId
        : this.consent.activeVersion(enrollment.studyId).then((active) => active?.id ?? null),
      known.lastSignedAt !== undefined
        ? known.lastSignedAt
        : this.consent.signaturesOf(enrollment.id).then((signatures) => signatures.at(-1)?.signedAt ?? null),
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
      activeVersionId !== null &&
      enrollment.signedVersionId !== activeVersionId &&
      !CLOSED_STATUSES.includes(enrollment.status);
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
        activeVersionId,
        signedVersionId: enrollment.signedVersionId,
        needsSignature,
        signedAt: lastSignedAt?.toISOString() ?? null,
      },
      assignment,
      steps: await this.stepViews.participantSteps(enrollment, stepList, needsSignature),
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
      const enrollment = await requireMine(manager, user, studyId, true);
      if (!['invited', 'screened', 'excluded'].includes(enrollment.status)) {
        throw new EnrollmentException(
          'PARTICIPATION_STATE',
          'Your screening answers are final once you have signed the consent form.',
        );
      }
      const definition = await this.studies.screeningDefinition(studyId, manager);
      const result = evaluateScreening(definition.eligibility, definition.stratification, answers);
      if (result.errors.length > 0) {
        const labels = Object.fromEntries(
          [...definition.eligibility, ...definition.stratification].map((q) => [q.key, q.label]),
        );
        throw new EnrollmentException(
          'VALIDATION_FAILED',
          screeningProblemMessage(result.errors, labels),
          result.errors,
        );
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
    const enrollment = await requireMine(this.dataSource.manager, user, studyId);
    const active = await this.consent.activeVersion(studyId);
    if (!active) throw new EnrollmentException('NOT_FOUND', 'The consent form for this study is not available yet.');
    return {
      ...this.consent.participantView(active),
      changesSinceSigned: await this.consent.changesSince(enrollment.signedVersionId, active),
    };
  }

  async myPdf(user: SessionUser, studyId: string) {
    const enrollment = await requireMine(this.dataSource.manager, user, studyId);
    const pdf = await this.consent.signedPdf(enrollment.id);
    if (!pdf)
      throw new EnrollmentException(
        'NOT_FOUND',
        'Your signed copy is still being prepared. Please try again in a moment.',
      );
    return pdf;
  }
}
