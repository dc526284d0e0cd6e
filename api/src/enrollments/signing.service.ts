import type { QueryDeepPartialEntity } from 'typeorm/query-builder/QueryPartialEntity';
import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import { AuditService } from '../audit';
import type { ClientInfo } from '../auth';
import type { SessionUser } from '../common/auth/session-user';
import { ConsentService } from '../consent';
import { JOB_NAMES, JobQueueService } from '../jobs/job-queue.service';
import { RandomizationService } from '../randomization';
import { StudiesService } from '../studies';
import { SignatureResultDto, SignConsentDto } from './dto/enrollment.dto';
import { EnrollmentException } from './enrollment.exception';
import { requireMine } from './enrollment-lookup';
import { EnrollmentEntity } from './entities/enrollment.entity';
import { ParticipationService } from './participation.service';

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

/**
 * Signing the consent form, the one path from the controller to the allocator: check the version, assign at the
 * first signature, record the signature and the audit events, and queue the signed copy (the outbox).
 */
@Injectable()
export class SigningService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly studies: StudiesService,
    private readonly consent: ConsentService,
    private readonly randomization: RandomizationService,
    private readonly jobs: JobQueueService,
    private readonly participation: ParticipationService,
  ) {}

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
    const outcome = await this.dataSource.transaction(async (manager) => {
      const enrollment = await requireMine(manager, user, studyId, true);
      const terms = await this.consent.signingTerms(manager, studyId, enrollment.id);
      if (!terms) throw new EnrollmentException('NO_CONSENT_TO_SIGN', 'There is no active consent form to sign.');
      const active = terms.version;
      if (input.versionId !== active.id || input.fingerprint !== active.fingerprint) {
        throw new EnrollmentException(
          'CONSENT_VERSION_STALE',
          'The consent form has changed since you opened it. Please read the current version.',
          undefined,
          {
            currentVersion: { versionId: active.id, version: active.version, fingerprint: active.fingerprint },
          },
        );
      }
      if (terms.existing) return { signature: terms.existing, created: false as const };
      const firstConsent = ['screened', 'consented'].includes(enrollment.status);
      const reconsent = ['assigned', 'active'].includes(enrollment.status);
      if (!firstConsent && !reconsent) {
        throw new EnrollmentException(
          'PARTICIPATION_STATE',
          enrollment.status === 'invited'
            ? 'Please answer the screening questions first.'
            : 'Your participation is closed, so there is nothing to sign.',
        );
      }
      const study = firstConsent ? await this.studies.require(studyId, manager) : undefined;
      if (study) {
        if (study.status !== 'recruiting')
          throw new EnrollmentException('STUDY_NOT_RECRUITING', 'This study is not taking new participants right now.');
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
      return { signature, created: true as const, signed: Object.assign(enrollment, changes), study, active };
    });
    const { signature, created } = outcome;
    // The participant's view, built on what signing already holds (the enrollment as written, the study, the version
    // just signed and when) instead of reading them again; a repeated request reads it afresh.
    const enrollment = outcome.created
      ? await this.participation.myView(outcome.signed, {
          study: outcome.study,
          activeVersionId: outcome.active.id,
          lastSignedAt: signature.signedAt,
        })
      : await this.participation.me(user, studyId);
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
}
