import type { ConsentToSign } from '@/features/consent/api/get-consent';
import type { MyEnrollment } from '@/features/enrollment/api/get-my-enrollment';
import type { PublicStudy } from '@/features/public-study/api/get-public-study';

// Invented demo data in the shapes of the api's OpenAPI document.

export const studyId = '7c1d2e4f-5a6b-4c8d-9e0f-1a2b3c4d5e6f';

export const publicStudy: PublicStudy = {
  id: studyId,
  slug: 'wayfinding-cues',
  title: 'Wayfinding cues',
  summary:
    'We want to learn which cues help people find their way in a building they do not know.\n\nYou will walk three short routes on a screen and tell us how sure you felt.',
  estimatedMinutes: 75,
  status: 'recruiting',
  protocolNumber: 'HL-2026-031',
  labName: 'Harbor Lane Cognition Lab',
  contactEmail: 'wayfinding@harborlane.test',
  currency: 'USD',
  totalPayMinor: 3750,
  steps: [
    { position: 2, title: 'Second session', description: 'Three more routes, a week later.', payMinor: 1500 },
    {
      position: 1,
      title: 'First session',
      description: 'Three routes on screen and a short questionnaire.',
      payMinor: 1250,
    },
    { position: 3, title: 'Follow-up questions', description: 'Ten minutes, online.', payMinor: 1000 },
  ],
  eligibility: [
    { key: 'adult', label: '18 or older' },
    { key: 'vision', label: 'able to read a screen without difficulty' },
  ],
};

export const screeningQuestions: MyEnrollment['screening']['questions'] = [
  { key: 'adult', label: 'Are you 18 or older?', kind: 'yes-no', purpose: 'eligibility' },
  {
    key: 'sense_of_direction',
    label: 'How good is your sense of direction?',
    kind: 'number',
    min: 1,
    max: 7,
    help: '1 means very poor, 7 means excellent.',
    purpose: 'stratification',
  },
  {
    key: 'commute',
    label: 'How do you usually get around town?',
    kind: 'choice',
    options: ['Walking', 'Cycling', 'Public transport', 'Car'],
    purpose: 'stratification',
  },
];

/** A step before assignment: no window yet, nothing to do. */
const unassignedStep = { status: 'locked', completedAt: null, hasTask: false, opensAt: null, dueAt: null } as const;

export function enrollment(overrides: Partial<MyEnrollment> = {}): MyEnrollment {
  return {
    id: 'e5a1c9d2-0b3f-4e6a-8c7d-2f1e0d9c8b7a',
    reference: 'WC-0042',
    studyId,
    studyTitle: publicStudy.title,
    studySlug: publicStudy.slug,
    currency: 'USD',
    status: 'invited',
    next: 'screening',
    screening: { questions: screeningQuestions, answers: null, exclusionReason: null },
    consent: { activeVersionId: versionId, signedVersionId: null, needsSignature: true, signedAt: null },
    assignment: null,
    steps: [
      {
        ...unassignedStep,
        id: 's1',
        position: 1,
        title: 'First session',
        description: 'Three routes on screen.',
        payMinor: 1250,
        hasCompletionCode: true,
        verification: 'shared-code',
      },
      {
        ...unassignedStep,
        id: 's2',
        position: 2,
        title: 'Second session',
        description: 'Three more routes.',
        payMinor: 1500,
        hasCompletionCode: true,
        verification: 'shared-code',
      },
      {
        ...unassignedStep,
        id: 's3',
        position: 3,
        title: 'Follow-up questions',
        description: 'Ten minutes, online.',
        payMinor: 1000,
        hasCompletionCode: false,
        verification: 'staff',
      },
    ],
    earned: { earnedMinor: 0, paidMinor: 0, stillToBePaidMinor: 0 },
    withdrewAt: null,
    ...overrides,
  };
}

export const versionId = '0f9e8d7c-6b5a-4938-8271-605f4e3d2c1b';
// SHA-256 of "abc" (FIPS 180-2, appendix B.1): a real 64-hex fingerprint to show.
export const fingerprint = 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad';

const keyInformationHtml =
  '<p>You are invited to a study on finding your way. It takes about 75 minutes over three sessions, pays up to $37.50, and carries no more risk than everyday life.</p>';

export function consentToSign(overrides: Partial<ConsentToSign> = {}): ConsentToSign {
  return {
    versionId,
    version: 2,
    fingerprint,
    readingMinutes: 6,
    keyInformationHtml,
    sections: [
      { id: 'key-information', heading: 'Key information', html: keyInformationHtml },
      {
        id: 'purpose',
        heading: 'Why we are doing this study',
        html: '<p>To learn which cues help people find their way.</p>',
      },
      { id: 'risks', heading: 'Risks and discomforts', html: '<p>You may feel a little tired after a session.</p>' },
      {
        id: 'questions',
        heading: 'Questions',
        html: '<p>Ask the research team, or the Harbor Lane Research Ethics Board at board@harborlane.test.</p>',
      },
    ],
    signatureMeaning: 'I have read this form and agree to take part',
    approval: { reference: 'HLREB-2026-014', approvedAt: '2026-01-12T15:00:00.000Z' },
    changesSinceSigned: [],
    ...overrides,
  };
}

export const assignment = {
  label: 'Route guide A',
  instructions: 'Before each route you will hear a short spoken hint.\n\nUse headphones if you can.',
};

/** When the demo participant signed; windows below count from here. */
export const assignedAt = '2026-02-03T14:05:00.000Z';

/** An enrollment right after signing: assigned, the first step open (due in a week), the others waiting their turn. */
export function signedEnrollment(overrides: Partial<MyEnrollment> = {}): MyEnrollment {
  const base = enrollment();
  return enrollment({
    status: 'assigned',
    next: 'steps',
    screening: { ...base.screening, answers: { adult: true, sense_of_direction: 5, commute: 'Walking' } },
    consent: { activeVersionId: versionId, signedVersionId: versionId, needsSignature: false, signedAt: assignedAt },
    assignment,
    steps: base.steps.map((step, index) =>
      index === 0
        ? { ...step, status: 'open', opensAt: assignedAt, dueAt: '2026-02-10T14:05:00.000Z' }
        : { ...step, status: 'waiting' },
    ),
    ...overrides,
  });
}

export const pdfBytes = '%PDF-1.7\n% signed consent (test)\n%%EOF\n';
