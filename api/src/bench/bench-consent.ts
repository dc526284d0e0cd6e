import type { INestApplicationContext } from '@nestjs/common';
import type { SessionUser } from '../common/auth/session-user';
import { ConsentService } from '../consent/consent.service';

/** Every template field filled (invented lab), so activation finds nothing left "to fill". */
const CONSENT_VALUES = {
  institutionName: 'Quillmoor Institute (invented)',
  investigatorName: 'Dr. Orla Fenwick (invented)',
  contactEmail: 'bench-lab@example.test',
  contactPhone: '+1 555 0199',
  ethicsBoardName: 'Quillmoor Research Ethics Board (invented)',
  ethicsBoardContact: 'ethics@example.test',
  studyPurpose: 'A benchmark study: nobody takes part in it.',
  paymentMethod: 'a transfer to the account you set up in the study portal',
  paymentDays: 14,
  dataRetentionYears: 5,
  futureUseDeidentified: false,
};
/** A minimal one-page PDF: the approval-letter check loads it as a PDF. */
const TINY_PDF = Buffer.from(
  '%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[3 0 R]/Count 1>>endobj\n' +
    '3 0 obj<</Type/Page/Parent 2 0 R/MediaBox[0 0 612 792]>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n',
  'latin1',
);

/** An approved, active consent version, as the admin screens make one; a study opens only with one. */
export async function activateBenchConsent(
  app: INestApplicationContext,
  researcher: SessionUser,
  studyId: string,
  reference: string,
) {
  const consent = app.get(ConsentService);
  const draft = await consent.createDraft(researcher, studyId, 'consent/minimal-risk-paid-study', CONSENT_VALUES);
  await consent.updateDraft(researcher, studyId, draft.id, { approvalReference: reference, approvedAt: '2026-11-20' });
  await consent.uploadApprovalLetter(researcher, studyId, draft.id, {
    buffer: TINY_PDF,
    originalname: 'approval.pdf',
    size: TINY_PDF.length,
  });
  const check = await consent.check(studyId, draft.id);
  if (!check.passes)
    throw new Error(`the bench consent form fails its check: ${check.findings.map((f) => f.message).join(' | ')}`);
  const active = await consent.activate(researcher, studyId, draft.id);
  if (!active.fingerprint) throw new Error('the activated consent version has no fingerprint');
  return { ...active, fingerprint: active.fingerprint };
}
