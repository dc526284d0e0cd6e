/**
 * Cache keys shared by features that read or change the same server state (a signature changes the enrollment,
 * a withdrawal changes the list of studies), so no feature has to import another to keep the screen true.
 */
export const queryKeys = {
  publicStudy: (slug: string) => ['public-studies', slug] as const,
  myStudies: ['studies', 'mine'] as const,
  /** Prefix of everything about one person's enrollment in one study. */
  myEnrollmentAll: (studyId: string) => ['enrollments', studyId, 'me'] as const,
  myEnrollment: (studyId: string) => ['enrollments', studyId, 'me', 'enrollment'] as const,
  consentToSign: (studyId: string) => ['enrollments', studyId, 'me', 'consent'] as const,
  signedConsentPdf: (studyId: string, signedVersionId: string) =>
    ['enrollments', studyId, 'me', 'consent.pdf', signedVersionId] as const,
  /** Prefix of everything about the signed-in person's pay: completing a step changes it. */
  myPayAll: ['me', 'pay'] as const,
  myPayouts: ['me', 'pay', 'payouts'] as const,
  myPayoutAccount: ['me', 'pay', 'payout-account'] as const,
};
