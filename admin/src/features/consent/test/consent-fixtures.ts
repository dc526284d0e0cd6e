import type { ConsentCheck } from '../api/check-consent-version';
import type { ConsentVersion } from '../api/get-consent-versions';

export const studyId = '8da5576c-4820-4de3-867c-b951081f13b2';

export const draftBody = [
  '# Consent to take part in a research study: Wayfinding cues',
  '',
  '## Key information about this study',
  '<!-- element: key-information -->',
  'This is research. You will find your way through a virtual building in three short sessions.',
  '',
  '## Who runs the study',
  'The study is run by [to fill: institution].',
].join('\n');

/** A template as GET /api/consent-templates lists it. */
export const consentTemplate = {
  id: 'consent/minimal-risk-paid-study',
  title: 'Consent form for a minimal-risk paid behavioural study',
  version: 1,
  // As GET /api/consent-templates lists it: more placeholders than the form asks for; the study fills the rest.
  fields: [
    'studyTitle',
    'institutionName',
    'investigatorName',
    'contactEmail',
    'ethicsBoardName',
    'paymentDays',
    'futureUseDeidentified',
  ],
  notice: "This template is a starting point for your ethics board's review, not legal advice.",
};

export function draftVersion(overrides: Partial<ConsentVersion> = {}): ConsentVersion {
  return {
    id: '0b9f5c1e-4d3a-4e8b-9a6f-2c7d1e5b8a40',
    version: 3,
    templateId: 'consent/minimal-risk-paid-study',
    templateValues: { investigatorName: 'Dr. Ines Valcourt', paymentDays: 7, futureUseDeidentified: true },
    status: 'draft',
    body: draftBody,
    previewHtml: '<h1>Consent to take part in a research study: Wayfinding cues</h1>',
    approvalReference: 'HLREB-2026-031-A2',
    approvedAt: '2026-11-20',
    approvalLetter: {
      name: 'HLREB-2026-031-A2.pdf',
      size: 1215,
      sha256: '9dfbcee9216a7e44adccaf82e401bc03644b6e6cbf1406b8f15f33d18acc2f70',
    },
    fingerprint: null,
    activeFrom: null,
    activeTo: null,
    readingMinutes: 6,
    signatures: 0,
    notice: "This template is a starting point for your ethics board's review, not legal advice.",
    ...overrides,
  };
}

/** Findings in the api's shape and order (api/src/consent/required-elements-check.ts): elements first, then placeholders. */
export const failingCheck: ConsentCheck = {
  passes: false,
  findings: [
    {
      code: 'missing-element',
      element: 'b2',
      citation: '45 CFR 46.116(b)(2)',
      line: null,
      message:
        'Foreseeable risks and discomforts (45 CFR 46.116(b)(2)) is missing. Add a section, for example headed "Possible risks and discomforts", that describes any reasonably foreseeable risks or discomforts of taking part.',
    },
    {
      code: 'unfilled-placeholder',
      element: null,
      citation: null,
      line: 8,
      message: 'Line 8 still says "[to fill: institution]": replace it with the study\'s details.',
    },
  ],
  required: [
    {
      id: 'key-information',
      citation: '45 CFR 46.116(a)(5)(i)',
      name: 'Key information',
      present: true,
      heading: 'Key information about this study',
      line: 3,
      recognisedBy: 'marker',
    },
    {
      id: 'b2',
      citation: '45 CFR 46.116(b)(2)',
      name: 'Foreseeable risks and discomforts',
      present: false,
      heading: null,
      line: null,
      recognisedBy: null,
    },
  ],
  optional: [],
};
