/**
 * The participant e-mails of the consent journey, from the templates in legal-templates/: subject (plain text),
 * a plain-text part and a sanitised HTML part. Views hold display-ready text; format amounts with formatMoney and
 * times with describeSigningTime first. The mail module adds the signed PDF to the signed-copy message.
 */
import { findTemplate, readTemplateSource } from '@evenhand/legal-templates';
import { renderConsentHtml, renderConsentPlainText } from './consent-markdown';
import { renderedConsentText } from './consent-text';
import { TemplateView, renderTemplate } from './template-rendering';

/** What every participant e-mail says about the person and the study; each template adds its own fields. */
export type EmailCommonView = {
  /** null when the participant gave no name: the greeting is then "Hello,". */
  participantName: string | null;
  studyTitle: string;
  labName: string;
  investigatorName: string;
  contactEmail: string;
  /** The participant's study page in the portal. */
  portalUrl: string;
};

export type SignedCopyEmailView = EmailCommonView & {
  signedAt: string;
  formVersion: string | number;
  textFingerprint: string;
};
export type WithdrawalConfirmationEmailView = EmailCommonView & {
  withdrawnAt: string;
  earnedAmount: string;
  paidAmount: string;
  owedAmount: string;
  hasOwedAmount: boolean;
  paymentMethod: string;
  paymentDays: number;
};
export type ReConsentRequestEmailView = EmailCommonView & {
  formVersion: string | number;
  ethicsBoardName: string;
  changeSummary: string;
};
export type StudyInvitationEmailView = EmailCommonView & {
  institutionName: string;
  studySummary: string;
  estimatedDuration: string;
  stepsPhrase: string;
  totalPay: string;
};

export type StepReminderEmailView = EmailCommonView & { stepTitle: string; timingSentence: string; stepPay: string };
export type StaffMessageEmailView = EmailCommonView & { subject: string; message: string };

export interface EmailViews {
  'email/step-reminder': StepReminderEmailView;
  'email/staff-message': StaffMessageEmailView;
  'email/signed-copy': SignedCopyEmailView;
  'email/withdrawal-confirmation': WithdrawalConfirmationEmailView;
  'email/re-consent-request': ReConsentRequestEmailView;
  'email/study-invitation': StudyInvitationEmailView;
}
export type EmailTemplateId = keyof EmailViews;

export interface RenderedEmail {
  templateId: EmailTemplateId;
  subject: string;
  text: string;
  html: string;
}

/** "Lab at Institution", or the lab alone when both are the same name (a lab that is its own institution). */
export function inviterName(labName: string, institutionName: string): string {
  const same = labName.trim().toLowerCase() === institutionName.trim().toLowerCase();
  return same || !institutionName.trim() ? labName : `${labName} at ${institutionName}`;
}

export function renderEmail<K extends EmailTemplateId>(templateId: K, view: EmailViews[K]): RenderedEmail {
  const template = findTemplate(templateId);
  const invitation = templateId === 'email/study-invitation' ? (view as StudyInvitationEmailView) : null;
  const templateView = (invitation
    ? { ...invitation, inviter: inviterName(invitation.labName, invitation.institutionName) }
    : view) as unknown as TemplateView;
  const body = renderedConsentText(
    renderTemplate(readTemplateSource(templateId), templateView, 'markdown', templateId),
    templateId,
  );
  return {
    templateId,
    subject: renderTemplate(template.subject ?? '', templateView, 'plain', `${templateId} subject`),
    text: renderConsentPlainText(body),
    html: renderConsentHtml(body),
  };
}
