import { expectStatus } from './http';
import { signInTokenFrom, uniqueAddress, waitForMail } from './mailbox';
import type { Browser } from './study-fixtures';
import type { TestApp } from './test-app';

/** Every template field filled, so the required-elements check has nothing left "to fill". */
export const FULL_CONSENT_VALUES = {
  institutionName: 'Harbor Lane Institute',
  investigatorName: 'Dr. Imre Valcourt',
  contactEmail: 'wayfinding@harborlane.test',
  contactPhone: '+1 555 0100',
  ethicsBoardName: 'Harbor Lane Research Ethics Board',
  ethicsBoardContact: 'ethics@harborlane.test',
  studyPurpose: 'We want to learn which kind of route cue helps people find their way in an unfamiliar building.',
  paymentMethod: 'a transfer to the account you set up in the study portal',
  paymentDays: 14,
  dataRetentionYears: 5,
  futureUseDeidentified: false,
};

/** A minimal one-page PDF: the approval-letter check loads it as a PDF. */
export const TINY_PDF = Buffer.from(
  '%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[3 0 R]/Count 1>>endobj\n' +
    '3 0 obj<</Type/Page/Parent 2 0 R/MediaBox[0 0 612 792]>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n',
  'latin1',
);

export async function activeConsentVersion(browser: Browser, studyId: string, reference = 'HLREB-2026-031') {
  const draft = await expectStatus(
    browser
      .post(`/api/studies/${studyId}/consent-versions`)
      .send({ templateId: 'consent/minimal-risk-paid-study', values: FULL_CONSENT_VALUES }),
    201,
  );
  await expectStatus(
    browser
      .patch(`/api/studies/${studyId}/consent-versions/${draft.id}`)
      .send({ approvalReference: reference, approvedAt: '2026-11-20' }),
    200,
  );
  await expectStatus(
    browser
      .post(`/api/studies/${studyId}/consent-versions/${draft.id}/approval-letter`)
      .attach('letter', TINY_PDF, 'approval.pdf'),
    200,
  );
  return expectStatus(browser.post(`/api/studies/${studyId}/consent-versions/${draft.id}/activate`), 200);
}

export async function signedInParticipant(
  testApp: TestApp,
  prefix = 'participant',
): Promise<{ browser: Browser; email: string }> {
  const email = uniqueAddress(prefix);
  await expectStatus(testApp.browser().post('/api/auth/sign-in-link').send({ email }), 202);
  const token = signInTokenFrom(await waitForMail(email));
  const browser = testApp.browser();
  await expectStatus(browser.post('/api/auth/sign-in-link/consume').send({ token }), 200);
  return { browser, email };
}

/**
 * A participant who signed in, joined the study, answered its screening (`screeningAnswers`, pretest 60 unless
 * given) and signed `version` with `typedName`; `me` is their enrollment as the portal reads it right after.
 */
export async function signedUpParticipant(
  testApp: TestApp,
  studyId: string,
  version: { id: string; fingerprint: string },
  prefix: string,
  typedName: string,
  screeningAnswers: Record<string, unknown> = { pretest: 60 },
) {
  const { browser, email } = await signedInParticipant(testApp, prefix);
  await expectStatus(browser.post(`/api/studies/${studyId}/enrollments/me`), 201);
  await expectStatus(
    browser.put(`/api/studies/${studyId}/enrollments/me/screening`).send({ answers: screeningAnswers }),
    200,
  );
  await expectStatus(
    browser
      .post(`/api/studies/${studyId}/enrollments/me/signature`)
      .send({ versionId: version.id, fingerprint: version.fingerprint, typedName }),
    201,
  );
  const me = await expectStatus(browser.get(`/api/studies/${studyId}/enrollments/me`), 200);
  return { browser, email, me };
}

/** What a study needs before it opens besides its design: a paid step (unless it has one) and an active consent form. */
export async function prepareToOpen(browser: Browser, studyId: string) {
  const steps = await expectStatus(browser.get(`/api/studies/${studyId}/steps`), 200);
  if (steps.items.length === 0)
    await expectStatus(browser.post(`/api/studies/${studyId}/steps`).send({ title: 'Session 1', payMinor: 1000 }), 201);
  return activeConsentVersion(browser, studyId);
}
