/**
 * A consent draft from a template in legal-templates/ and the study's fields. Free-text fields the study has not
 * filled in yet become visible "[to fill: …]" markers, which the required-elements check reports until someone
 * replaces them; structurally wrong input (no steps, a negative pay, a bad currency) is refused by field.
 */
import { findTemplate, readTemplateSource } from '@evenhand/legal-templates';
import { ConsentError, ConsentErrorCode, FieldError } from './consent-error';
import { formatDuration, formatMoney } from './study-formatting';
import { MarkdownFragment, TemplateView, renderTemplate, toFill } from './template-rendering';

export const DEFAULT_CONSENT_TEMPLATE_ID = 'consent/minimal-risk-paid-study';

export interface ConsentStepFields {
  title: string;
  description?: string | null;
  /** Minor units of the study's currency. */
  payMinor: number;
  estimatedMinutes?: number | null;
}

export interface ConsentTemplateFields {
  studyTitle: string;
  protocolNumber?: string | null;
  institutionName?: string | null;
  labName?: string | null;
  investigatorName?: string | null;
  contactEmail?: string | null;
  contactPhone?: string | null;
  ethicsBoardName?: string | null;
  ethicsBoardContact?: string | null;
  /** One or two plain sentences; the study's summary. */
  studyPurpose?: string | null;
  /** Total time; when absent, the sum of the steps' minutes if every step has them. */
  estimatedMinutes?: number | null;
  targetSize?: number | null;
  steps: ConsentStepFields[];
  currency: string;
  /** e.g. "bank transfer through our payment provider". */
  paymentMethod?: string | null;
  /** Days after a step is confirmed within which payment is sent. */
  paymentDays?: number | null;
  dataRetentionYears?: number | null;
  /** (b)(9): true — de-identified data may be used in future research; false — it will not be. */
  futureUseDeidentified: boolean;
  /** The optional 46.116(c) sections; each is included unless set to false. */
  include?: { investigatorEndsParticipation?: boolean; withdrawalConsequences?: boolean; participantCount?: boolean };
  /** BCP 47 locale for amounts; en-US by default. */
  locale?: string;
}

const EMAIL = /^[^\s@]+@[^\s@]+\.[^\s@]+$/;

function text(value: string | null | undefined, label: string): string | MarkdownFragment {
  return typeof value === 'string' && value.trim() !== '' ? value : toFill(label);
}

function count(
  value: number | null | undefined,
  label: string,
  field: string,
  errors: FieldError[],
  min = 1,
): string | MarkdownFragment {
  if (value === null || value === undefined) return toFill(label);
  if (!Number.isSafeInteger(value) || value < min) {
    errors.push({ field, message: `must be a whole number ≥ ${min}, got ${String(value)}` });
    return '';
  }
  return String(value);
}

export function consentTemplateView(fields: ConsentTemplateFields): TemplateView {
  const errors: FieldError[] = [];
  if (typeof fields?.studyTitle !== 'string' || fields.studyTitle.trim() === '')
    errors.push({ field: 'studyTitle', message: 'is required' });
  if (!Array.isArray(fields?.steps) || fields.steps.length === 0)
    errors.push({ field: 'steps', message: 'must list at least one step with its pay' });
  if (typeof fields?.currency !== 'string' || !/^[A-Z]{3}$/.test(fields.currency)) {
    errors.push({
      field: 'currency',
      message: `must be an ISO 4217 code in capitals such as USD, got ${JSON.stringify(fields?.currency)}`,
    });
  }
  if (fields?.contactEmail && !EMAIL.test(fields.contactEmail.trim()))
    errors.push({ field: 'contactEmail', message: 'must be an e-mail address' });
  if (typeof fields?.futureUseDeidentified !== 'boolean') {
    errors.push({
      field: 'futureUseDeidentified',
      message: 'must say (true or false) whether de-identified data may be used in future research',
    });
  }
  const steps = Array.isArray(fields?.steps) ? fields.steps : [];
  steps.forEach((step, i) => {
    if (typeof step?.title !== 'string' || step.title.trim() === '')
      errors.push({ field: `steps[${i}].title`, message: 'is required' });
    if (!Number.isSafeInteger(step?.payMinor) || step.payMinor < 0) {
      errors.push({
        field: `steps[${i}].payMinor`,
        message: `must be a whole number of minor units ≥ 0, got ${String(step?.payMinor)}`,
      });
    }
    if (step?.estimatedMinutes != null && (!Number.isSafeInteger(step.estimatedMinutes) || step.estimatedMinutes < 1)) {
      errors.push({
        field: `steps[${i}].estimatedMinutes`,
        message: `must be a whole number of minutes ≥ 1, got ${String(step.estimatedMinutes)}`,
      });
    }
  });
  if (
    fields?.estimatedMinutes != null &&
    (!Number.isSafeInteger(fields.estimatedMinutes) || fields.estimatedMinutes < 1)
  ) {
    errors.push({
      field: 'estimatedMinutes',
      message: `must be a whole number of minutes ≥ 1, got ${String(fields.estimatedMinutes)}`,
    });
  }
  const targetSize = count(fields?.targetSize, 'approximate number of participants', 'targetSize', errors);
  const paymentDays = count(fields?.paymentDays, 'days within which payment is sent', 'paymentDays', errors);
  const dataRetentionYears = count(
    fields?.dataRetentionYears,
    'years the records are kept',
    'dataRetentionYears',
    errors,
  );
  if (errors.length > 0) throw new ConsentError(ConsentErrorCode.InvalidFields, errors);

  const locale = fields.locale ?? 'en-US';
  const money = (minor: number, field: string) => formatMoney(minor, fields.currency, locale, field);
  const stepMinutes = steps.map((s) => s.estimatedMinutes ?? null);
  const totalMinutes =
    fields.estimatedMinutes ??
    (stepMinutes.every((m) => m !== null) ? stepMinutes.reduce((a, m) => a + (m ?? 0), 0) : null);
  const include = fields.include ?? {};

  return {
    studyTitle: fields.studyTitle,
    protocolNumber: text(fields.protocolNumber, 'ethics protocol number'),
    institutionName: text(fields.institutionName, 'institution'),
    labName: text(fields.labName, 'lab or research group'),
    investigatorName: text(fields.investigatorName, 'investigator in charge'),
    contactEmail: text(fields.contactEmail, "investigator's e-mail address"),
    contactPhone: fields.contactPhone?.trim() ? fields.contactPhone : null,
    ethicsBoardName: text(fields.ethicsBoardName, 'ethics board'),
    ethicsBoardContact: text(fields.ethicsBoardContact, "ethics board's e-mail address or telephone number"),
    studyPurpose: text(fields.studyPurpose, 'purpose of the study in one or two plain sentences'),
    estimatedDuration: totalMinutes === null ? toFill('total time') : formatDuration(totalMinutes),
    stepsPhrase: `${steps.length} ${steps.length === 1 ? 'step' : 'steps'}`,
    steps: steps.map((step, i) => ({
      position: i + 1,
      title: step.title,
      description: step.description?.trim() ? step.description : null,
      pay: money(step.payMinor, `steps[${i}].payMinor`),
      minutes: step.estimatedMinutes ?? null,
    })),
    totalPay: money(
      steps.reduce((sum, step) => sum + step.payMinor, 0),
      'steps',
    ),
    paymentMethod: text(fields.paymentMethod, 'how payment is sent'),
    paymentDays,
    dataRetentionYears,
    targetSize,
    futureUseDeidentified: fields.futureUseDeidentified,
    includeInvestigatorEndsParticipation: include.investigatorEndsParticipation !== false,
    includeWithdrawalConsequences: include.withdrawalConsequences !== false,
    includeParticipantCount: include.participantCount !== false,
  };
}

/** The draft body (Markdown, staff comments and element markers kept) for a new consent version. */
export function fillConsentTemplate(fields: ConsentTemplateFields, templateId = DEFAULT_CONSENT_TEMPLATE_ID): string {
  let kind: string;
  try {
    kind = findTemplate(templateId).kind;
  } catch (error: unknown) {
    throw new ConsentError(ConsentErrorCode.InvalidTemplate, [
      {
        field: 'templateId',
        message: error instanceof Error ? error.message.replace(/^templateId: /, '') : String(error),
      },
    ]);
  }
  if (kind !== 'consent')
    throw new ConsentError(ConsentErrorCode.InvalidTemplate, [
      { field: 'templateId', message: `"${templateId}" is not a consent form template` },
    ]);
  return fillConsentTemplateSource(readTemplateSource(templateId), fields);
}

export function fillConsentTemplateSource(templateSource: string, fields: ConsentTemplateFields): string {
  return renderTemplate(templateSource, consentTemplateView(fields), 'markdown');
}
