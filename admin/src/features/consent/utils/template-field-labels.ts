import type { ConsentValueField } from '../api/create-consent-draft';

export interface TemplateFieldLabel {
  label: string;
  hint?: string;
  kind: 'text' | 'email' | 'tel' | 'number' | 'long-text' | 'yes-no';
  group: 'people' | 'board' | 'study' | 'payment' | 'data';
}

// Plain words for the template's placeholders (legal-templates/consent/minimal-risk-paid-study).
export const templateFieldLabels: Record<ConsentValueField, TemplateFieldLabel> = {
  institutionName: {
    label: 'Institution',
    hint: 'The university or organisation responsible for the study.',
    kind: 'text',
    group: 'people',
  },
  investigatorName: { label: 'Investigator in charge', kind: 'text', group: 'people' },
  contactEmail: {
    label: 'Contact e-mail for questions',
    hint: 'Leave blank to use the study’s contact address.',
    kind: 'email',
    group: 'people',
  },
  contactPhone: { label: 'Contact telephone', kind: 'tel', group: 'people' },
  ethicsBoardName: {
    label: 'Name of the ethics board',
    hint: 'The board that reviews and approves the study.',
    kind: 'text',
    group: 'board',
  },
  ethicsBoardContact: {
    label: 'How to reach the ethics board',
    hint: 'An e-mail address or telephone number.',
    kind: 'text',
    group: 'board',
  },
  studyPurpose: {
    label: 'Purpose of the study, in plain words',
    hint: 'Leave blank to use the study’s summary.',
    kind: 'long-text',
    group: 'study',
  },
  paymentMethod: {
    label: 'How participants are paid',
    hint: 'For example: bank transfer through our payment provider.',
    kind: 'text',
    group: 'payment',
  },
  paymentDays: { label: 'Days until payment is sent', kind: 'number', group: 'payment' },
  dataRetentionYears: { label: 'Years the records are kept', kind: 'number', group: 'data' },
  futureUseDeidentified: {
    label: 'De-identified data may be used in future research',
    hint: 'The form must say either way (45 CFR 46.116(b)(9)).',
    kind: 'yes-no',
    group: 'data',
  },
};

export const templateFieldGroups: { id: TemplateFieldLabel['group']; legend: string }[] = [
  { id: 'people', legend: 'Who runs the study' },
  { id: 'board', legend: 'Ethics board' },
  { id: 'study', legend: 'The study' },
  { id: 'payment', legend: 'Payment' },
  { id: 'data', legend: 'Records and data' },
];

/** The fields of the form that this template uses, in the form's order. */
export function fieldsForTemplate(templateFields: readonly string[]): ConsentValueField[] {
  return (Object.keys(templateFieldLabels) as ConsentValueField[]).filter((field) => templateFields.includes(field));
}
