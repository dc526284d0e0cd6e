import { Injectable, Logger, OnModuleInit } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import { ConsentException } from '../consent.exception';
import { AppConfig, DEVELOPMENT_SIGNING_PASSPHRASE } from '../../config/app-config';
import { renderEmail } from '../consent-emails';
import { ConsentService } from '../consent.service';
import { describeSigningTime } from '../study-formatting';
import { JOB_NAMES, JobQueueService } from '../../jobs/job-queue.service';
import { MailService } from '../../mail/mail.service';
import { SignedCopyRecipientsReadModel } from '../../reporting';
import { StudiesService } from '../../studies';
import { buildSignedConsentPdf, PdfSealIdentity } from './signed-consent-pdf';
import { loadSigningIdentity } from './signing-certificate';

/**
 * Makes the signed copy of a consent form, stores it with its SHA-256, and e-mails it to the signer
 * (45 CFR 46.117(a)). The copy is sealed with the lab's document-signing certificate (a PDF digital signature), and
 * its SHA-256 is kept. Runs as a job; each part is skipped when already done, so a retry never sends twice.
 */
@Injectable()
export class SignedCopyService implements OnModuleInit {
  private readonly logger = new Logger('SignedCopy');
  private identity: PdfSealIdentity | null = null;

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly config: AppConfig,
    private readonly jobs: JobQueueService,
    private readonly consent: ConsentService,
    private readonly recipients: SignedCopyRecipientsReadModel,
    private readonly studies: StudiesService,
    private readonly mail: MailService,
  ) {}

  async onModuleInit(): Promise<void> {
    if (
      this.config.nodeEnv === 'production' &&
      this.config.documentSigningPassphrase === DEVELOPMENT_SIGNING_PASSPHRASE
    ) {
      throw new Error('DOCUMENT_SIGNING_PASSPHRASE: the development default may not be used in production');
    }
    this.identity = loadSigningIdentity({
      path: this.config.documentSigningP12,
      passphrase: this.config.documentSigningPassphrase,
      mayCreate: this.config.nodeEnv !== 'production',
    });
    await this.jobs.handle<{ signatureId: string }>(JOB_NAMES.signedCopy, ({ signatureId }) =>
      this.makeSignedCopy(signatureId),
    );
  }

  async makeSignedCopy(signatureId: string): Promise<void> {
    const signature = await this.consent.signatureWithPdf(signatureId);
    if (!signature) {
      this.logger.warn(`signature ${signatureId} is gone; nothing to do`);
      return;
    }
    const enrollment = await this.recipients.of(signature.enrollmentId);
    if (!enrollment) throw new ConsentException('NOT_FOUND', 'No such enrollment.');
    const study = await this.studies.require(enrollment.studyId);
    const version = await this.consent.get(enrollment.studyId, signature.consentVersionId);
    let pdf = signature.pdf;
    if (!pdf) {
      const built = await buildSignedConsentPdf(
        {
          consentText: version.renderedText!,
          textFingerprint: signature.textFingerprint,
          studyTitle: study.title,
          labName: study.labName || 'The research team',
          formVersion: version.version,
          consentVersionId: version.id,
          ethicsApprovalReference: version.approvalReference ?? '',
          ethicsApprovedOn: version.approvedAt ?? '',
          enrollmentReference: enrollment.reference,
          signatureId: signature.id,
          signer: {
            typedName: signature.typedName,
            signedAt: signature.signedAt,
            timeZone: signature.timeZone ?? 'UTC',
            meaning: signature.meaning,
            markPngDataUrl: signature.mark,
            ipAddress: signature.ip ?? 'not recorded',
            userAgent: signature.userAgent ?? 'not recorded',
          },
        },
        this.identity ?? undefined,
      );
      pdf = Buffer.from(built.bytes);
      await this.consent.storeSignedPdf(signature.id, pdf, built.sha256);
    }
    if (!signature.copyEmailedAt) {
      const signedAt = describeSigningTime(signature.signedAt, signature.timeZone ?? 'UTC');
      const email = renderEmail('email/signed-copy', {
        participantName: signature.typedName,
        studyTitle: study.title,
        labName: study.labName || 'The research team',
        investigatorName: study.labName || 'The research team',
        contactEmail: study.contactEmail ?? this.config.mailFrom,
        portalUrl: new URL(`/s/${study.slug}`, this.config.portalUrl).toString(),
        signedAt: signedAt.text,
        formVersion: version.version,
        textFingerprint: signature.textFingerprint,
      });
      await this.mail.deliver({
        to: enrollment.email,
        subject: email.subject,
        text: email.text,
        html: email.html,
        attachments: [
          { filename: `signed-consent-v${version.version}.pdf`, content: pdf, contentType: 'application/pdf' },
        ],
      });
      await this.consent.markCopyEmailed(signature.id);
    }
  }
}
