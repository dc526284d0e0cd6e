'use strict';
// Plain CommonJS so the api (CommonJS TypeScript) and vitest load it without a build step.
const fs = require('node:fs');
const path = require('node:path');

const STAFF_NOTICE =
  'This template is a starting point for your ethics board\'s review, not legal advice. ' +
  'The board that approves the study decides the final wording.';

/** Placeholders every e-mail template may use, filled from the study and the participant. */
const EMAIL_COMMON_FIELDS = ['participantName', 'studyTitle', 'labName', 'investigatorName', 'contactEmail', 'portalUrl'];

const templates = [
  {
    id: 'consent/minimal-risk-paid-study',
    kind: 'consent',
    version: 1,
    title: 'Consent form for a minimal-risk paid behavioural study',
    file: 'consent/minimal-risk-paid-study.md',
    fields: [
      'studyTitle', 'protocolNumber', 'institutionName', 'labName', 'investigatorName', 'contactEmail', 'contactPhone',
      'ethicsBoardName', 'ethicsBoardContact', 'studyPurpose', 'estimatedDuration', 'stepsPhrase', 'steps', 'totalPay',
      'paymentMethod', 'paymentDays', 'dataRetentionYears', 'targetSize', 'futureUseDeidentified',
      'includeInvestigatorEndsParticipation', 'includeWithdrawalConsequences', 'includeParticipantCount',
    ],
  },
  {
    id: 'email/signed-copy',
    kind: 'email',
    version: 1,
    title: 'Signed copy of the consent form (PDF attached)',
    subject: 'Your signed consent form for {{studyTitle}}',
    file: 'emails/signed-copy.md',
    fields: [...EMAIL_COMMON_FIELDS, 'signedAt', 'formVersion', 'textFingerprint'],
  },
  {
    id: 'email/withdrawal-confirmation',
    kind: 'email',
    version: 1,
    title: 'Confirmation of withdrawal, with pay earned and still to come',
    subject: 'You have stopped taking part in {{studyTitle}}',
    file: 'emails/withdrawal-confirmation.md',
    fields: [...EMAIL_COMMON_FIELDS, 'withdrawnAt', 'earnedAmount', 'paidAmount', 'owedAmount', 'hasOwedAmount', 'paymentMethod', 'paymentDays'],
  },
  {
    id: 'email/re-consent-request',
    kind: 'email',
    version: 1,
    title: 'Request to sign a new consent form version',
    subject: 'Please review the updated consent form for {{studyTitle}}',
    file: 'emails/re-consent-request.md',
    fields: [...EMAIL_COMMON_FIELDS, 'formVersion', 'ethicsBoardName', 'changeSummary'],
  },
  {
    id: 'email/study-invitation',
    kind: 'email',
    version: 1,
    title: 'Invitation to take part in a study',
    subject: 'Invitation to take part in a research study: {{studyTitle}}',
    file: 'emails/study-invitation.md',
    fields: [...EMAIL_COMMON_FIELDS, 'inviter', 'studySummary', 'estimatedDuration', 'stepsPhrase', 'totalPay'],
  },
  {
    id: 'email/step-reminder',
    kind: 'email',
    version: 1,
    title: 'Reminder about a study step (the same for every condition)',
    subject: 'Reminder: {{stepTitle}} ({{studyTitle}})',
    file: 'emails/step-reminder.md',
    fields: [...EMAIL_COMMON_FIELDS, 'stepTitle', 'timingSentence', 'stepPay'],
  },
  {
    id: 'email/staff-message',
    kind: 'email',
    version: 1,
    title: 'A message from the research team to one participant',
    subject: '{{subject}}',
    file: 'emails/staff-message.md',
    fields: [...EMAIL_COMMON_FIELDS, 'subject', 'message'],
  },
].map((template) => Object.freeze({ ...template, notice: STAFF_NOTICE, path: path.join(__dirname, template.file) }));

const fonts = Object.freeze({
  family: 'DejaVu Sans',
  version: '2.37',
  regular: path.join(__dirname, 'fonts', 'DejaVuSans.ttf'),
  bold: path.join(__dirname, 'fonts', 'DejaVuSans-Bold.ttf'),
  licence: path.join(__dirname, 'fonts', 'LICENSE-DejaVu.txt'),
});

function findTemplate(id) {
  const template = templates.find((t) => t.id === id);
  if (!template) {
    throw new Error(`templateId: no template "${id}"; known: ${templates.map((t) => t.id).join(', ')}`);
  }
  return template;
}

/** The template's source text (Markdown with mustache placeholders and staff comments), UTF-8. */
function readTemplateSource(id) {
  return fs.readFileSync(findTemplate(id).path, 'utf8');
}

module.exports = { STAFF_NOTICE, templates, fonts, findTemplate, readTemplateSource };
