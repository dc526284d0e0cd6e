import type { ConsentTemplateValues } from '@evenhand/contract';
import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { templates, STAFF_NOTICE } from '@evenhand/legal-templates';
import { createHash } from 'node:crypto';
import { DataSource, EntityManager, IsNull } from 'typeorm';
import { AuditActor, AuditService } from '../audit';
import { ConsentException } from './consent.exception';
import { StepsService } from '../steps';
import { StudiesService } from '../studies';
import { approvalLetterProblem } from './approval-letter-check';
import { renderConsentHtml } from './consent-markdown';
import { readingSections, ReadingSection } from './consent-reading';
import { ConsentTemplateFields, DEFAULT_CONSENT_TEMPLATE_ID, fillConsentTemplate } from './consent-template';
import { renderedConsentText, renderedTextFingerprint } from './consent-text';
import { ConsentCheckDto, ConsentVersionDto, UpdateConsentVersionDto } from './dto/consent.dto';
import { ConsentVersionEntity } from './entities/consent-version.entity';
import { SignatureEntity } from './entities/signature.entity';
import { estimateReadingTime } from './reading-time';
import { checkRequiredElements } from './required-elements-check';
import { isFutureApprovalDate } from './approval-date';
import { summarizeConsentChanges } from './consent-changes';

export const MAX_APPROVAL_LETTER_BYTES = 10 * 1024 * 1024;
/** The meaning of the signature, stated beside the button and printed on the signed copy (21 CFR 11.50(a)(3)). */
export const SIGNATURE_MEANING = 'I have read this form and agree to take part';

/** Only the fields that were given, as a plain object (what is stored and what a change touches). */
function givenFields(values: object): Record<string, unknown> {
  return Object.fromEntries(Object.entries(values).filter(([, value]) => value !== undefined));
}

export type ActivationListener = (
  manager: EntityManager,
  studyId: string,
  version: ConsentVersionEntity,
  actor: AuditActor,
) => Promise<void>;

@Injectable()
export class ConsentService {
  private readonly activationListeners: ActivationListener[] = [];

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly studies: StudiesService,
    private readonly steps: StepsService,
  ) {
    this.studies.addOpeningRequirement({
      key: 'consent',
      label: 'An active consent version',
      order: 4,
      check: async (manager, studyId) =>
        (await this.activeVersion(studyId, manager)) ? null : 'activate an approved consent version',
    });
  }

  /** Lets the enrollments domain flag people for re-consent in the same transaction as an activation. */
  onActivation(listener: ActivationListener): void {
    this.activationListeners.push(listener);
  }

  listTemplates() {
    return templates
      .filter((t) => t.kind === 'consent')
      .map(({ id, title, version, fields, notice }) => ({ id, title, version, fields: [...fields], notice }));
  }

  async list(studyId: string): Promise<ConsentVersionDto[]> {
    await this.studies.require(studyId);
    const versions = await this.dataSource
      .getRepository(ConsentVersionEntity)
      .find({ where: { studyId }, order: { version: 'DESC' } });
    return Promise.all(versions.map((v) => this.toDto(v)));
  }

  /** With `lock`, holds the version's row until the transaction ends (activation and refilling take it). */
  async get(
    studyId: string,
    versionId: string,
    manager: EntityManager = this.dataSource.manager,
    lock = false,
  ): Promise<ConsentVersionEntity> {
    const version = await manager.findOne(ConsentVersionEntity, {
      where: { id: versionId, studyId },
      ...(lock && { lock: { mode: 'pessimistic_write' as const } }),
    });
    if (!version) throw new ConsentException('NOT_FOUND', 'No such consent version in this study.');
    return version;
  }

  async toDto(version: ConsentVersionEntity): Promise<ConsentVersionDto> {
    const [{ n }] = await this.dataSource.query(`SELECT count(*) AS n FROM signature WHERE consent_version_id = $1`, [
      version.id,
    ]);
    let previewHtml = '';
    try {
      previewHtml = renderConsentHtml(version.body);
    } catch {
      previewHtml = '';
    }
    return {
      id: version.id,
      version: version.version,
      templateId: version.templateId,
      templateValues: version.templateValues as ConsentTemplateValues,
      status: version.status,
      body: version.body,
      previewHtml,
      approvalReference: version.approvalReference,
      approvedAt: version.approvedAt,
      approvalLetter: version.approvalLetterSha256
        ? {
            name: version.approvalLetterName,
            size: version.approvalLetterSize ?? 0,
            sha256: version.approvalLetterSha256,
          }
        : null,
      fingerprint: version.fingerprint,
      activeFrom: version.activeFrom?.toISOString() ?? null,
      activeTo: version.activeTo?.toISOString() ?? null,
      readingMinutes: this.readingMinutes(version.body),
      signatures: Number(n),
      notice: STAFF_NOTICE,
    };
  }

  readingMinutes(body: string): number {
    try {
      return estimateReadingTime(body).minutes;
    } catch {
      return 0;
    }
  }

  /** A new draft filled from the template with the study's own fields, plus the values given. */
  async createDraft(
    actor: AuditActor,
    studyId: string,
    templateId: string,
    values: ConsentTemplateValues = {},
  ): Promise<ConsentVersionDto> {
    const known = templates.find((t) => t.id === templateId && t.kind === 'consent');
    if (!known) {
      throw new ConsentException('VALIDATION_FAILED', 'Unknown consent template.', [
        {
          field: 'templateId',
          message: `must be one of ${
            this.listTemplates()
              .map((t) => t.id)
              .join(', ') || DEFAULT_CONSENT_TEMPLATE_ID
          }`,
        },
      ]);
    }
    const body = fillConsentTemplate(await this.templateFields(studyId, values), templateId);
    const created = await this.dataSource.transaction(async (manager) => {
      await manager.query(`SELECT pg_advisory_xact_lock(hashtextextended($1, 0))`, [`consent-version:${studyId}`]);
      const [{ next }] = await manager.query(
        `SELECT coalesce(max(version), 0) + 1 AS next FROM consent_version WHERE study_id = $1`,
        [studyId],
      );
      const version = await manager.save(
        manager.create(ConsentVersionEntity, {
          studyId,
          version: Number(next),
          templateId,
          templateValues: givenFields(values),
          body,
          status: 'draft',
          createdBy: actor.id,
        }),
      );
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'consent.draft-created',
        subjectType: 'consent-version',
        subjectId: version.id,
        data: { version: version.version, templateId },
      });
      return version;
    });
    return this.toDto(created);
  }

  /**
   * Fills a draft in again from its own template, the study's fields and steps as they are now, and the values given
   * (which replace the stored ones). The whole text is replaced, hand edits to the wording included.
   */
  async refillDraft(
    actor: AuditActor,
    studyId: string,
    versionId: string,
    values: ConsentTemplateValues,
  ): Promise<ConsentVersionDto> {
    const refilled = await this.dataSource.transaction(async (manager) => {
      // The same row lock activation takes, so a draft cannot be refilled while it is being activated.
      const version = await this.get(studyId, versionId, manager, true);
      if (version.status !== 'draft') {
        throw new ConsentException(
          'CONSENT_VERSION_NOT_DRAFT',
          `Version ${version.version} is ${version.status}, so its text is fixed; create a new draft to change the wording.`,
        );
      }
      version.body = fillConsentTemplate(await this.templateFields(studyId, values, manager), version.templateId);
      version.templateValues = givenFields(values);
      const saved = await manager.save(version);
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'consent.draft-refilled',
        subjectType: 'consent-version',
        subjectId: versionId,
        data: { version: version.version, templateId: version.templateId, fields: Object.keys(version.templateValues) },
      });
      return saved;
    });
    return this.toDto(refilled);
  }

  /** What a template is filled with: the study's fields and steps as they are now, plus the values staff gave. */
  private async templateFields(
    studyId: string,
    values: ConsentTemplateValues,
    manager: EntityManager = this.dataSource.manager,
  ): Promise<ConsentTemplateFields> {
    const study = await this.studies.require(studyId, manager);
    const steps = await this.steps.list(studyId, manager);
    return {
      studyTitle: study.title,
      protocolNumber: study.protocolNumber,
      labName: study.labName || null,
      contactEmail: values.contactEmail ?? study.contactEmail,
      studyPurpose: values.studyPurpose ?? (study.summary || null),
      estimatedMinutes: study.estimatedMinutes,
      targetSize: study.targetSize,
      currency: study.currency,
      steps: steps.items.map((s) => ({ title: s.title, description: s.description || null, payMinor: s.payMinor })),
      futureUseDeidentified: values.futureUseDeidentified ?? false,
      institutionName: values.institutionName,
      investigatorName: values.investigatorName,
      contactPhone: values.contactPhone,
      ethicsBoardName: values.ethicsBoardName,
      ethicsBoardContact: values.ethicsBoardContact,
      paymentMethod: values.paymentMethod,
      paymentDays: values.paymentDays,
      dataRetentionYears: values.dataRetentionYears,
    };
  }

  async updateDraft(
    actor: AuditActor,
    studyId: string,
    versionId: string,
    input: UpdateConsentVersionDto,
  ): Promise<ConsentVersionDto> {
    const updated = await this.dataSource.transaction(async (manager) => {
      const version = await this.get(studyId, versionId, manager);
      if (version.status !== 'draft')
        throw new ConsentException(
          'CONSENT_VERSION_NOT_DRAFT',
          'An approved version is fixed; create a new draft to change the wording.',
        );
      if (input.body !== undefined) {
        try {
          renderedConsentText(input.body);
        } catch (error) {
          throw new ConsentException('VALIDATION_FAILED', 'The form text cannot be used.', [
            { field: 'body', message: (error as Error).message },
          ]);
        }
      }
      if (input.approvedAt !== undefined && isFutureApprovalDate(input.approvedAt)) {
        throw new ConsentException('VALIDATION_FAILED', 'The approval date cannot be in the future.', [
          { field: 'approvedAt', message: 'is in the future: enter the date printed on the approval letter' },
        ]);
      }
      const changes = givenFields(input);
      Object.assign(version, changes);
      const saved = await manager.save(version);
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'consent.draft-updated',
        subjectType: 'consent-version',
        subjectId: versionId,
        data: { fields: Object.keys(changes) },
      });
      return saved;
    });
    return this.toDto(updated);
  }

  async check(studyId: string, versionId: string): Promise<ConsentCheckDto> {
    const version = await this.get(studyId, versionId);
    return checkRequiredElements(version.body) as unknown as ConsentCheckDto;
  }

  /** Stores the ethics approval letter after checking it really is a PDF (by loading it, not by its name). */
  async uploadApprovalLetter(
    actor: AuditActor,
    studyId: string,
    versionId: string,
    file: { buffer: Buffer; originalname: string; size: number } | undefined,
  ): Promise<ConsentVersionDto> {
    if (!file)
      throw new ConsentException('VALIDATION_FAILED', 'Attach the approval letter as a PDF file.', [
        { field: 'letter', message: 'is required' },
      ]);
    if (file.size === 0 || file.buffer.length === 0) {
      throw new ConsentException('VALIDATION_FAILED', 'The file is empty.', [{ field: 'letter', message: 'is empty' }]);
    }
    if (file.size > MAX_APPROVAL_LETTER_BYTES) {
      throw new ConsentException('PAYLOAD_TOO_LARGE', 'The approval letter may be at most 10 MB.', [
        { field: 'letter', message: 'is larger than 10 MB' },
      ]);
    }
    const problem = await approvalLetterProblem(file.buffer, file.originalname);
    if (problem)
      throw new ConsentException('UNSUPPORTED_MEDIA_TYPE', 'The approval letter must be a PDF file.', [problem]);
    const sha256 = createHash('sha256').update(file.buffer).digest('hex');
    const updated = await this.dataSource.transaction(async (manager) => {
      const version = await this.get(studyId, versionId, manager);
      if (version.status !== 'draft')
        throw new ConsentException(
          'CONSENT_VERSION_NOT_DRAFT',
          'The letter of an approved version cannot be replaced.',
        );
      await manager.update(
        ConsentVersionEntity,
        { id: versionId },
        {
          approvalLetter: file.buffer,
          approvalLetterSha256: sha256,
          approvalLetterName: file.originalname.slice(0, 200),
          approvalLetterSize: file.size,
        },
      );
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'consent.approval-letter-uploaded',
        subjectType: 'consent-version',
        subjectId: versionId,
        data: { sha256, size: file.size, name: file.originalname },
      });
      return this.get(studyId, versionId, manager);
    });
    return this.toDto(updated);
  }

  async approvalLetter(studyId: string, versionId: string): Promise<{ bytes: Buffer; name: string }> {
    const row = await this.dataSource
      .createQueryBuilder(ConsentVersionEntity, 'v')
      .addSelect('v.approvalLetter')
      .where('v.id = :versionId AND v.study_id = :studyId', { versionId, studyId })
      .getOne();
    if (!row?.approvalLetter)
      throw new ConsentException('NOT_FOUND', 'No approval letter has been uploaded for this version.');
    return { bytes: row.approvalLetter, name: row.approvalLetterName ?? `approval-letter-v${row.version}.pdf` };
  }

  /**
   * Activates a draft: needs the approval reference, date and letter and a form that passes the required-elements
   * check. Fixes the rendered text and its fingerprint, retires the previous version (never deletes it).
   */
  async activate(actor: AuditActor, studyId: string, versionId: string): Promise<ConsentVersionDto> {
    const activated = await this.dataSource.transaction(async (manager) => {
      await this.studies.require(studyId, manager, true);
      const version = await this.get(studyId, versionId, manager, true);
      if (version.status !== 'draft')
        throw new ConsentException(
          'CONSENT_VERSION_NOT_DRAFT',
          `Version ${version.version} is already ${version.status}.`,
        );
      const missing = [
        !version.approvalReference && {
          field: 'approvalReference',
          message: 'the ethics approval reference is required',
        },
        !version.approvedAt && { field: 'approvedAt', message: 'the approval date is required' },
        !version.approvalLetterSha256 && { field: 'letter', message: 'upload the approval letter (PDF) first' },
      ].filter(Boolean) as Array<{ field: string; message: string }>;
      if (missing.length)
        throw new ConsentException('CONSENT_VERSION_NOT_READY', 'The version is not ready to activate.', missing);
      const report = checkRequiredElements(version.body);
      if (!report.passes) {
        throw new ConsentException(
          'CONSENT_VERSION_NOT_READY',
          'The form is missing required elements; fix them before activation.',
          report.findings.map((f) => ({ field: f.element ? `body.${f.element}` : 'body', message: f.message })),
        );
      }
      const renderedText = renderedConsentText(version.body);
      const fingerprint = renderedTextFingerprint(renderedText);
      const now = new Date();
      const previous = await manager.findOne(ConsentVersionEntity, { where: { studyId, status: 'active' } });
      if (previous) {
        await manager.update(ConsentVersionEntity, { id: previous.id }, { status: 'retired', activeTo: now });
        await this.audit.record(manager, {
          chain: studyId,
          actor,
          action: 'consent.retired',
          subjectType: 'consent-version',
          subjectId: previous.id,
          data: { version: previous.version },
        });
      }
      await manager.update(
        ConsentVersionEntity,
        { id: versionId },
        { status: 'active', renderedText, fingerprint, activeFrom: now },
      );
      const active = (await manager.findOne(ConsentVersionEntity, { where: { id: versionId } }))!;
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'consent.activated',
        subjectType: 'consent-version',
        subjectId: versionId,
        data: {
          version: active.version,
          fingerprint,
          approvalReference: active.approvalReference,
          letterSha256: active.approvalLetterSha256,
        },
      });
      for (const listener of this.activationListeners) await listener(manager, studyId, active, actor);
      return active;
    });
    return this.toDto(activated);
  }

  /** The version people sign now, read with a share lock so an activation cannot slip in mid-signature. */
  async activeVersion(
    studyId: string,
    manager: EntityManager = this.dataSource.manager,
    lock = false,
  ): Promise<ConsentVersionEntity | null> {
    const builder = manager
      .createQueryBuilder(ConsentVersionEntity, 'v')
      .where("v.study_id = :studyId AND v.status = 'active'", { studyId });
    if (lock) builder.setLock('pessimistic_read');
    return builder.getOne();
  }

  /**
   * What changed between the version someone signed and a newer one, in plain sentences (empty when they signed
   * this one, or signed none).
   */
  async changesSince(
    signedVersionId: string | null,
    current: ConsentVersionEntity,
    manager: EntityManager = this.dataSource.manager,
  ): Promise<string[]> {
    if (!signedVersionId || signedVersionId === current.id) return [];
    const signed = await manager.findOne(ConsentVersionEntity, {
      where: { id: signedVersionId, studyId: current.studyId },
    });
    return signed ? summarizeConsentChanges(signed, current) : [];
  }

  participantView(version: ConsentVersionEntity): {
    versionId: string;
    version: number;
    fingerprint: string;
    readingMinutes: number;
    keyInformationHtml: string;
    sections: ReadingSection[];
    signatureMeaning: string;
    approval: { reference: string; approvedAt: string };
  } {
    const sections = readingSections(version.renderedText ?? version.body);
    return {
      versionId: version.id,
      version: version.version,
      fingerprint: version.fingerprint!,
      readingMinutes: this.readingMinutes(version.renderedText ?? version.body),
      keyInformationHtml: sections[0]?.html ?? '',
      sections,
      signatureMeaning: SIGNATURE_MEANING,
      approval: { reference: version.approvalReference ?? '', approvedAt: version.approvedAt ?? '' },
    };
  }

  /**
   * For signing, in one round trip: the active version's identity (shared-locked, so it cannot be replaced until
   * the signing commits; its text is not loaded) and this enrollment's signature of it, if any.
   */
  async signingTerms(
    manager: EntityManager,
    studyId: string,
    enrollmentId: string,
  ): Promise<{
    version: Pick<ConsentVersionEntity, 'id' | 'version' | 'fingerprint'>;
    existing: SignatureEntity | null;
  } | null> {
    const [row]: Array<{ id: string; version: number; fingerprint: string | null; signature_id: string | null }> =
      await manager.query(
        `SELECT v.id, v.version, v.fingerprint, s.id AS signature_id
       FROM consent_version v LEFT JOIN signature s ON s.consent_version_id = v.id AND s.enrollment_id = $2
       WHERE v.study_id = $1 AND v.status = 'active' FOR SHARE OF v`,
        [studyId, enrollmentId],
      );
    if (!row) return null;
    const existing = row.signature_id
      ? await manager.findOne(SignatureEntity, { where: { id: row.signature_id } })
      : null;
    return { version: { id: row.id, version: row.version, fingerprint: row.fingerprint }, existing };
  }

  async signatureFor(manager: EntityManager, enrollmentId: string, versionId: string): Promise<SignatureEntity | null> {
    return manager.findOne(SignatureEntity, { where: { enrollmentId, consentVersionId: versionId } });
  }

  async recordSignature(
    manager: EntityManager,
    input: {
      enrollmentId: string;
      version: Pick<ConsentVersionEntity, 'id' | 'fingerprint'>;
      typedName: string;
      mark: string | null;
      timeZone: string | null;
      ip: string | null;
      userAgent: string | null;
    },
  ): Promise<SignatureEntity> {
    return manager.save(
      manager.create(SignatureEntity, {
        enrollmentId: input.enrollmentId,
        consentVersionId: input.version.id,
        typedName: input.typedName,
        mark: input.mark,
        meaning: SIGNATURE_MEANING,
        signedAt: new Date(),
        timeZone: input.timeZone,
        ip: input.ip,
        userAgent: input.userAgent,
        textFingerprint: input.version.fingerprint!,
      }),
    );
  }

  signatureWithPdf(signatureId: string): Promise<SignatureEntity | null> {
    return this.dataSource
      .createQueryBuilder(SignatureEntity, 's')
      .addSelect('s.pdf')
      .where('s.id = :signatureId', { signatureId })
      .getOne();
  }

  async storeSignedPdf(signatureId: string, pdf: Buffer, sha256: string): Promise<void> {
    await this.dataSource
      .getRepository(SignatureEntity)
      .update({ id: signatureId, pdfSha256: IsNull() }, { pdf, pdfSha256: sha256, pdfReadyAt: new Date() });
  }

  async markCopyEmailed(signatureId: string): Promise<void> {
    await this.dataSource.getRepository(SignatureEntity).update({ id: signatureId }, { copyEmailedAt: new Date() });
  }

  signaturesOf(enrollmentId: string): Promise<SignatureEntity[]> {
    return this.dataSource.getRepository(SignatureEntity).find({ where: { enrollmentId }, order: { signedAt: 'ASC' } });
  }

  async signedPdf(
    enrollmentId: string,
    signatureId?: string,
  ): Promise<{ bytes: Buffer; sha256: string; version: number } | null> {
    const builder = this.dataSource
      .createQueryBuilder(SignatureEntity, 's')
      .addSelect('s.pdf')
      .innerJoin(ConsentVersionEntity, 'v', 'v.id = s.consent_version_id')
      .addSelect('v.version', 'version')
      .where('s.enrollment_id = :enrollmentId AND s.pdf IS NOT NULL', { enrollmentId });
    if (signatureId) builder.andWhere('s.id = :signatureId', { signatureId });
    const { entities, raw } = await builder.orderBy('s.signed_at', 'DESC').limit(1).getRawAndEntities();
    const signature = entities[0];
    if (!signature?.pdf) return null;
    return { bytes: signature.pdf, sha256: signature.pdfSha256!, version: Number(raw[0].version) };
  }
}
