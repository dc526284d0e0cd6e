import type { ConsentTemplateFields } from './consent-template';

/** The demo lab's between-subjects study (invented people and places). */
export const wayfindingConsentFields: ConsentTemplateFields = {
  studyTitle: 'Wayfinding cues',
  protocolNumber: 'HLCL-2025-014',
  institutionName: 'Harbor Lane Institute',
  labName: 'Harbor Lane Cognition Lab',
  investigatorName: 'Dr. Ines Valcourt',
  contactEmail: 'wayfinding@harbor-lane.test',
  contactPhone: null,
  ethicsBoardName: 'the Harbor Lane Research Ethics Board',
  ethicsBoardContact: 'ethics-board@harbor-lane.test',
  studyPurpose:
    'We want to learn whether sound cues or map cues help people find their way through an unfamiliar virtual town.',
  estimatedMinutes: null,
  targetSize: 180,
  steps: [
    { title: 'Session 1: practice town', payMinor: 1000, estimatedMinutes: 20 },
    {
      title: 'Session 2: test town',
      description: 'You find five landmarks in a new town.',
      payMinor: 1500,
      estimatedMinutes: 30,
    },
    { title: 'Follow-up questionnaire', payMinor: 500, estimatedMinutes: 10 },
  ],
  currency: 'USD',
  paymentMethod: 'bank transfer through our payment provider',
  paymentDays: 7,
  dataRetentionYears: 5,
  futureUseDeidentified: true,
};
