/**
 * The audit trail in plain words: every action the api records, its family, a short name of our own and the
 * sentence a person reads ("Coordinator C. Vasquez-Hale approved 3 payouts, $36.00 in all"). Pure: everything a
 * sentence needs (who acted, which participant, the step's title, the study's currency) comes in `SentenceContext`,
 * looked up by the audit trail's read model. The stored action codes stay as written (the hash covers them); what a
 * person reads is only ever what this file says. `audit-sentences.spec.ts` fails when the api records an action that
 * has no sentence here.
 */

export const ACTION_FAMILIES = [
  { key: 'sign-in', label: 'Signing in', description: 'Sign-ins, sign-outs and refused attempts' },
  {
    key: 'accounts',
    label: 'Accounts',
    description: 'Staff accounts made, changed or deactivated; participant accounts made',
  },
  { key: 'membership', label: 'Study membership', description: 'Who works on which study' },
  {
    key: 'settings',
    label: 'Study settings',
    description: 'Study details, conditions, steps, pay, screening, reminders',
  },
  { key: 'consent', label: 'Consent', description: 'Consent versions, approval letters, signatures' },
  {
    key: 'enrollment',
    label: 'Enrollment',
    description: 'Joining, screening, invitations, withdrawal, lost to follow-up',
  },
  {
    key: 'assignment',
    label: 'Assignment',
    description: 'The assignment scheme, its sealed sequence, each assignment, unblinding',
  },
  { key: 'steps', label: 'Steps', description: 'Steps done, undone, and refused codes or return links' },
  { key: 'contact', label: 'Messages', description: 'Messages staff sent to participants' },
  { key: 'watch', label: 'Dropout watch', description: 'Dropout alerts set and sent' },
  { key: 'payouts', label: 'Payouts', description: 'Payouts approved, paid, not sent, sent again or taken back' },
  { key: 'funding', label: 'Funding', description: 'Money added to a study’s balance' },
  { key: 'exports', label: 'Exports', description: 'Data sets taken out of Evenhand' },
  { key: 'audit-receipts', label: 'Audit receipts', description: 'Receipts sealed and the trail’s own upkeep' },
  { key: 'other', label: 'Other', description: 'Events this version of Evenhand has no words for' },
] as const;

export type ActionFamily = (typeof ACTION_FAMILIES)[number]['key'];
export const ACTION_FAMILY_KEYS: readonly ActionFamily[] = ACTION_FAMILIES.map((family) => family.key);

export interface SentencePerson {
  name: string;
  email: string;
  role: string;
}

/** What the read model knows about one event beyond its own columns. */
export interface SentenceContext {
  /** The person behind actorId, when the account exists. */
  actor: SentencePerson | null;
  /** The participant the event is about (their reference in the study), when there is one. */
  participantReference: string | null;
  /** Whether the actor is that participant. */
  actorIsParticipant: boolean;
  /** The account a sign-in, account or membership event is about. */
  subjectPerson: SentencePerson | null;
  /** The step named by the event (its subject or `data.stepId`). */
  stepTitle: string | null;
  /** The study's currency, for amounts in the study's chain. */
  currency: string | null;
  /** The amount of the payout the event is about. */
  payoutAmountMinor: number | null;
}

export interface SentenceEvent {
  action: string;
  actorEmail: string | null;
  subjectId: string | null;
  data: Record<string, unknown>;
}

export interface EventInWords {
  family: ActionFamily;
  /** Our own short name of the action, e.g. "Payouts approved". */
  name: string;
  sentence: string;
  /** The amount the event moved or owed, when it has one. */
  amount: { minor: number; currency: string } | null;
}

interface Words {
  who: string;
  /** "participant P-7KQ2XA", or "a participant" when unknown. */
  participant: string;
  /** "Participant P-7KQ2XA", for the start of a sentence. */
  Participant: string;
  step: string;
  money: (minor: unknown) => string;
  data: Record<string, unknown>;
  event: SentenceEvent;
  context: SentenceContext;
}

interface ActionWords {
  family: ActionFamily;
  name: string;
  sentence: (w: Words) => string;
  /** Where the event's amount comes from, if it has one. */
  amountMinor?: (w: Words) => number | null;
}

const ROLE_NAMES: Record<string, string> = {
  admin: 'Lab admin',
  coordinator: 'Coordinator',
  researcher: 'Researcher',
  auditor: 'Auditor',
  participant: 'Participant',
};

const VERIFICATION_WORDS: Record<string, string> = {
  'return-link': 'by the return link from the task',
  'participant-code': 'with their own code',
  'shared-code': 'with the step’s code',
  staff: 'by staff',
};

const RETURN_REFUSALS: Record<string, string> = {
  malformed: 'the link was incomplete',
  forged: 'the link’s signature did not match',
  expired: 'the link had expired',
  'other-person': 'it was opened by someone signed in as another person',
  'not-open': 'the step was not open yet',
  'not-taking-part': 'the participant is no longer taking part',
  consent: 'the participant had a new consent version to sign first',
};

const METHOD_WORDS: Record<string, string> = {
  simple: 'simple randomization',
  'permuted-blocks': 'permuted blocks',
  'stratified-blocks': 'stratified permuted blocks',
  minimization: 'minimization',
  'matched-pairs': 'matched pairs',
  counterbalanced: 'counterbalanced orders',
  'latin-square': 'a Latin square',
  williams: 'a Williams design',
};

/** "Coordinator C. Vasquez-Hale": role, first initial, last name. */
export function personPhrase(person: SentencePerson): string {
  const role = ROLE_NAMES[person.role] ?? 'Someone';
  const parts = person.name.trim().split(/\s+/).filter(Boolean);
  if (parts.length === 0) return `${role} ${person.email}`;
  if (parts.length === 1) return `${role} ${parts[0]}`;
  return `${role} ${parts[0].charAt(0)}. ${parts[parts.length - 1]}`;
}

function withArticle(role: string): string {
  const word = (ROLE_NAMES[role] ?? role).toLowerCase();
  return `${/^[aeiou]/.test(word) ? 'an' : 'a'} ${word}`;
}

function plural(count: unknown, one: string, many = `${one}s`): string {
  const n = typeof count === 'number' ? count : Number(count ?? 0);
  return `${n} ${n === 1 ? one : many}`;
}

function quoted(value: unknown): string {
  return `“${String(value ?? '').trim()}”`;
}

function fieldList(changes: unknown): string {
  if (!changes || typeof changes !== 'object') return 'its settings';
  const keys = Object.keys(changes as Record<string, unknown>);
  if (keys.length === 0) return 'its settings';
  const words = keys.map((key) => key.replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase());
  return words.length === 1 ? words[0] : `${words.slice(0, -1).join(', ')} and ${words[words.length - 1]}`;
}

function listOf(values: unknown): string {
  const items = Array.isArray(values) ? values.map(String) : [];
  if (items.length === 0) return 'none';
  return items.length === 1 ? items[0] : `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

/** Amounts in the study's currency; integer minor units in, "$36.00" out. */
export function formatAmount(minor: number, currency: string | null): string {
  const code = (currency ?? '').trim().toUpperCase();
  try {
    if (!code) throw new Error('no currency');
    const format = new Intl.NumberFormat('en-US', { style: 'currency', currency: code });
    const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
    return format.format(minor / 10 ** digits);
  } catch {
    return `${(minor / 100).toFixed(2)}${code ? ` ${code}` : ''}`;
  }
}

const numberOrNull = (value: unknown): number | null =>
  typeof value === 'number' && Number.isFinite(value) ? value : null;

const payoutAmount = (w: Words): number | null => numberOrNull(w.data.amountMinor) ?? w.context.payoutAmountMinor;

/** Every action the api records. Old codes stay readable: events already written keep the code they were written with. */
export const AUDIT_ACTIONS: Record<string, ActionWords> = {
  // ── signing in ──
  'auth.signed-in': {
    family: 'sign-in',
    name: 'Signed in',
    sentence: (w) =>
      `${w.who} signed in ${
        w.data.method === 'link'
          ? 'with an e-mailed link'
          : w.data.secondFactor === 'code'
            ? 'with a password and a two-factor code'
            : w.data.secondFactor === 'recovery-code'
              ? 'with a password and a recovery code'
              : 'with a password'
      }.`,
  },
  'auth.sign-in-failed': {
    family: 'sign-in',
    name: 'Sign-in refused',
    sentence: (w) => {
      const who = w.event.subjectId ?? 'an unknown address';
      if (w.data.method === 'two-factor-code')
        return `A sign-in as ${who} gave the right password but a wrong or used two-factor code, and was refused.`;
      if (w.data.method === 'recovery-code')
        return `A sign-in as ${who} gave the right password but a wrong or used recovery code, and was refused.`;
      return `A password sign-in as ${who} was refused.`;
    },
  },
  'auth.two-factor-enabled': {
    family: 'sign-in',
    name: 'Two-factor sign-in turned on',
    sentence: (w) => `${w.who} turned on two-factor sign-in for their account and received new recovery codes.`,
  },
  'auth.two-factor-disabled': {
    family: 'sign-in',
    name: 'Two-factor sign-in turned off',
    sentence: (w) => `${w.who} turned off two-factor sign-in for their account; its recovery codes no longer work.`,
  },
  'auth.recovery-codes-renewed': {
    family: 'sign-in',
    name: 'Recovery codes renewed',
    sentence: (w) => `${w.who} made new recovery codes; the earlier ones no longer work.`,
  },
  'auth.recovery-code-used': {
    family: 'sign-in',
    name: 'Recovery code used',
    sentence: (w) => {
      const left = numberOrNull(w.data.recoveryCodesLeft);
      return `${w.who} signed in with a recovery code instead of a two-factor code${left === null ? '' : `; ${left} ${left === 1 ? 'code is' : 'codes are'} left`}.`;
    },
  },
  'lab.two-factor-requirement-changed': {
    family: 'accounts',
    name: 'Two-factor requirement for admins changed',
    sentence: (w) =>
      w.data.twoFactorRequiredForAdmins === true
        ? `${w.who} required every admin to sign in with a two-factor code.`
        : `${w.who} stopped requiring two-factor sign-in of admins.`,
  },
  'auth.signed-out': { family: 'sign-in', name: 'Signed out', sentence: (w) => `${w.who} signed out.` },
  'auth.refresh-reuse-detected': {
    family: 'sign-in',
    name: 'Session ended as a precaution',
    sentence: (w) =>
      `A session token of ${w.context.subjectPerson ? personPhrase(w.context.subjectPerson) : 'an account'} was used twice, so that session was ended.`,
  },
  // ── accounts ──
  'user.created': {
    family: 'accounts',
    name: 'Account made',
    sentence: (w) =>
      w.data.via === 'sign-in-link'
        ? `${w.context.actorIsParticipant ? w.Participant : w.who} got a participant account at their first sign-in.`
        : `${w.who} made a staff account for ${String(w.data.email ?? 'someone')} as ${withArticle(String(w.data.role ?? 'staff'))}.`,
  },
  'user.updated': {
    family: 'accounts',
    name: 'Staff account changed',
    sentence: (w) =>
      `${w.who} changed the ${fieldList(w.data.changes)} of the staff account ${String(w.data.email ?? '')}.`.replace(
        ' .',
        '.',
      ),
  },
  'user.password-changed': {
    family: 'accounts',
    name: 'Password changed',
    sentence: (w) => `${w.who} changed their own password.`,
  },
  'user.password-reset': {
    family: 'accounts',
    name: 'Password set from an e-mailed link',
    sentence: (w) =>
      `A new password was set for the staff account ${String(w.data.email ?? '')} from an e-mailed link; its other sessions ended.`,
  },
  'user.deactivated': {
    family: 'accounts',
    name: 'Staff account deactivated',
    sentence: (w) => `${w.who} deactivated the staff account ${String(w.data.email ?? '')}.`,
  },
  // ── membership ──
  'study.member-added': {
    family: 'membership',
    name: 'Member added',
    sentence: (w) =>
      `${w.who} added ${String(w.data.email ?? 'someone')} to the study as ${withArticle(String(w.data.role ?? 'member'))}.`,
  },
  'study.member-removed': {
    family: 'membership',
    name: 'Member removed',
    sentence: (w) =>
      `${w.who} removed ${w.context.subjectPerson ? w.context.subjectPerson.email : 'a member'} (${withArticle(String(w.data.role ?? 'member'))}) from the study.`,
  },
  // ── study settings ──
  'study.created': {
    family: 'settings',
    name: 'Study created',
    sentence: (w) => `${w.who} created the study ${quoted(w.data.title)}.`,
  },
  'study.updated': {
    family: 'settings',
    name: 'Study details changed',
    sentence: (w) => `${w.who} changed the study’s ${fieldList(w.data.changes)}.`,
  },
  'study.opened': {
    family: 'settings',
    name: 'Study opened',
    sentence: (w) => `${w.who} ${w.data.from === 'paused' ? 'reopened' : 'opened'} the study for recruiting.`,
  },
  'study.archived': {
    family: 'settings',
    name: 'Study archived',
    sentence: (w) => `${w.who} archived the closed study, taking it out of the default lists.`,
  },
  'study.unarchived': {
    family: 'settings',
    name: 'Study brought back from the archive',
    sentence: (w) => `${w.who} brought the study back from the archive.`,
  },
  'study.paused': { family: 'settings', name: 'Study paused', sentence: (w) => `${w.who} paused recruiting.` },
  'study.closed': { family: 'settings', name: 'Study closed', sentence: (w) => `${w.who} closed the study.` },
  'condition.created': {
    family: 'settings',
    name: 'Condition added',
    sentence: (w) => `${w.who} added the condition ${quoted(w.data.internalName)}.`,
  },
  'condition.updated': {
    family: 'settings',
    name: 'Condition changed',
    sentence: (w) => `${w.who} changed a condition’s ${fieldList(w.data.changes)}.`,
  },
  'stratification.replaced': {
    family: 'settings',
    name: 'Strata set',
    sentence: (w) => {
      const factors = Array.isArray(w.data.factors)
        ? (w.data.factors as Array<{ key?: unknown }>).map((factor) => factor.key)
        : [];
      return factors.length
        ? `${w.who} set the stratification factors: ${listOf(factors)}.`
        : `${w.who} removed the stratification factors.`;
    },
  },
  'screening.replaced': {
    family: 'settings',
    name: 'Screening questions set',
    sentence: (w) =>
      `${w.who} set the screening questions (${plural(Array.isArray(w.data.keys) ? w.data.keys.length : 0, 'question')}).`,
  },
  'step.created': {
    family: 'settings',
    name: 'Step added',
    sentence: (w) => `${w.who} added the step ${quoted(w.data.title)}, paying ${w.money(w.data.payMinor)}.`,
  },
  'step.updated': {
    family: 'settings',
    name: 'Step changed',
    sentence: (w) => `${w.who} changed the ${fieldList(w.data.changes)} of the step ${w.step}.`,
  },
  'step.pay-override-recorded': {
    family: 'settings',
    name: 'Pay exception recorded',
    sentence: (w) =>
      `${w.who} set a different pay of ${w.money(w.data.payMinor)} for one condition on the step ${w.step}, because ${quoted(w.data.reason)}.`,
  },
  'step.pay-override-removed': {
    family: 'settings',
    name: 'Pay exception removed',
    sentence: (w) => `${w.who} removed the different pay for one condition on the step ${w.step}.`,
  },
  'step.completion-code-set': {
    family: 'settings',
    name: 'Step code set',
    sentence: (w) => `${w.who} set a new code for the step ${w.step}.`,
  },
  'step.verification-set': {
    family: 'settings',
    name: 'Step checking set',
    sentence: (w) =>
      `${w.who} set how the step ${w.step} is checked: ${VERIFICATION_WORDS[String(w.data.verification)] ?? 'as configured'}.`,
  },
  'step.return-key-rotated': {
    family: 'settings',
    name: 'Return-link key replaced',
    sentence: (w) => `${w.who} replaced the key that signs the study’s return links.`,
  },
  'reminders.plan-saved': {
    family: 'settings',
    name: 'Reminder plan saved',
    sentence: (w) =>
      `${w.who} saved the reminder plan with ${plural(Array.isArray(w.data.rules) ? w.data.rules.length : 0, 'reminder')}${w.data.enabled === false ? ', switched off' : ''}.`,
  },
  // ── consent ──
  'consent.draft-created': {
    family: 'consent',
    name: 'Consent draft started',
    sentence: (w) => `${w.who} started consent version ${String(w.data.version ?? '')} from a template.`,
  },
  'consent.draft-refilled': {
    family: 'consent',
    name: 'Consent draft refilled',
    sentence: (w) => `${w.who} filled consent version ${String(w.data.version ?? '')} in again from its template.`,
  },
  'consent.draft-updated': {
    family: 'consent',
    name: 'Consent draft edited',
    sentence: (w) =>
      `${w.who} edited the ${fieldList(Object.fromEntries(listKeys(w.data.fields)))} of a draft consent version.`,
  },
  'consent.approval-letter-uploaded': {
    family: 'consent',
    name: 'Approval letter added',
    sentence: (w) => `${w.who} uploaded the ethics approval letter ${quoted(w.data.name)}.`,
  },
  'consent.activated': {
    family: 'consent',
    name: 'Consent version in use',
    sentence: (w) =>
      `${w.who} made consent version ${String(w.data.version ?? '')} the one participants sign${w.data.approvalReference ? ` (ethics approval ${String(w.data.approvalReference)})` : ''}.`,
  },
  'consent.retired': {
    family: 'consent',
    name: 'Consent version retired',
    sentence: (w) => `Consent version ${String(w.data.version ?? '')} was retired by ${lower(w.who)}.`,
  },
  'consent.reconsent-requested': {
    family: 'consent',
    name: 'Asked to sign again',
    sentence: (w) =>
      `${plural(w.data.enrollments, 'enrolled participant')} will be asked to sign consent version ${String(w.data.version ?? '')} before their next step.`,
  },
  'consent.reconsent-reminded': {
    family: 'consent',
    name: 'Reminded to sign again',
    sentence: (w) => `${w.who} reminded ${plural(w.data.count, 'participant')} to sign the new consent version.`,
  },
  'consent.signed': {
    family: 'consent',
    name: 'Consent signed',
    sentence: (w) => `${w.Participant} signed consent version ${String(w.data.version ?? '')}.`,
  },
  'consent.re-signed': {
    family: 'consent',
    name: 'New consent version signed',
    sentence: (w) => `${w.Participant} signed the new consent version ${String(w.data.version ?? '')}.`,
  },
  // ── enrollment ──
  'enrollment.joined': { family: 'enrollment', name: 'Joined', sentence: (w) => `${w.Participant} joined the study.` },
  'enrollment.screened': {
    family: 'enrollment',
    name: 'Screened in',
    sentence: (w) => `${w.Participant} answered the screening questions and can take part.`,
  },
  'enrollment.excluded': {
    family: 'enrollment',
    name: 'Screened out',
    sentence: (w) => `${w.Participant} answered the screening questions and cannot take part.`,
  },
  'enrollment.withdrew': {
    family: 'enrollment',
    name: 'Withdrew',
    sentence: (w) =>
      (w.data.by === 'staff'
        ? `${w.who} withdrew ${w.participant} from the study`
        : `${w.Participant} withdrew from the study`) + (w.data.reason ? `, saying ${quoted(w.data.reason)}.` : '.'),
  },
  'enrollment.lost': {
    family: 'enrollment',
    name: 'Lost to follow-up',
    sentence: (w) =>
      `${w.who} marked ${w.participant} as lost to follow-up${w.data.reason ? `: ${quoted(w.data.reason)}` : ''}.`,
  },
  'enrollment.lost-undone': {
    family: 'enrollment',
    name: 'Back from lost to follow-up',
    sentence: (w) => `${w.who} put ${w.participant} back to taking part, because ${quoted(w.data.reason)}.`,
  },
  'roster.imported': {
    family: 'enrollment',
    name: 'Roster imported',
    sentence: (w) =>
      `${w.who} imported a roster: ${plural(w.data.created, 'new participant')}, ${String(w.data.alreadyEnrolled ?? 0)} already on it, ${plural(w.data.rowErrors, 'row')} refused.`,
  },
  'roster.invited': {
    family: 'enrollment',
    name: 'Invitations sent',
    sentence: (w) => `${w.who} sent ${plural(w.data.count, 'invitation')}.`,
  },
  // ── assignment ──
  'assignment.scheme-saved': {
    family: 'assignment',
    name: 'Assignment scheme saved',
    sentence: (w) =>
      `${w.who} saved the assignment scheme: ${METHOD_WORDS[String(w.data.method)] ?? String(w.data.method ?? 'a scheme')}.`,
  },
  'assignment.committed': {
    family: 'assignment',
    name: 'Sequence sealed',
    sentence: (w) =>
      `${w.who} sealed the assignment sequence; its fingerprint begins ${String(w.data.commitment ?? '').slice(0, 12)}.`,
  },
  'assignment.recommitted': {
    family: 'assignment',
    name: 'Sequence sealed again',
    sentence: (w) =>
      `${w.who} sealed a new assignment sequence after the design changed; its fingerprint begins ${String(w.data.commitment ?? '').slice(0, 12)}.`,
  },
  'assignment.allocated': {
    family: 'assignment',
    name: 'Assigned',
    sentence: (w) =>
      `${w.Participant} was assigned at signing, number ${String(w.data.sequence ?? '?')} in the sequence${w.data.stratumKey ? ` of stratum ${String(w.data.stratumKey)}` : ''}.`,
  },
  'assignment.unblinded': {
    family: 'assignment',
    name: 'Unblinded',
    sentence: (w) => `${w.who} unblinded the study, giving the reason ${quoted(w.data.reason)}.`,
  },
  'assignment.seed-revealed': {
    family: 'assignment',
    name: 'Seed revealed',
    sentence: (w) =>
      `The assignment seed was revealed when ${lower(w.who)} closed the study, so anyone can re-derive the sequence.`,
  },
  'assignment.cohort-paired': {
    family: 'assignment',
    name: 'Cohort paired',
    sentence: (w) =>
      `${w.who} paired ${plural(w.data.cohort, 'pretested participant')} into ${plural(w.data.pairs, 'pair')}.`,
  },
  // ── steps ──
  'step.completed': {
    family: 'steps',
    name: 'Step done',
    sentence: (w) => {
      const owed = numberOrNull(w.data.payMinor) ? `; ${w.money(w.data.payMinor)} is owed` : '';
      const last = w.data.completedStudy ? ' That was their last step.' : '';
      return w.data.verifiedBy === 'staff'
        ? `${w.who} marked the step ${w.step} done for ${w.participant}${owed}.${last}`
        : `${w.Participant} finished the step ${w.step}, checked ${VERIFICATION_WORDS[String(w.data.verifiedBy)] ?? 'by the study'}${owed}.${last}`;
    },
    amountMinor: (w) => numberOrNull(w.data.payMinor),
  },
  'step.completion-undone': {
    family: 'steps',
    name: 'Step undone',
    sentence: (w) => `${w.who} undid the step ${w.step} for ${w.participant}, because ${quoted(w.data.reason)}.`,
  },
  'step.list-marked': {
    family: 'steps',
    name: 'Steps marked from a list',
    sentence: (w) =>
      `${w.who} marked the step ${w.step} done from a list of ${plural(w.data.lines, 'line')}: ${String(w.data.completed ?? 0)} done now, ${String(w.data.alreadyDone ?? 0)} already done, ${String(Array.isArray(w.data.failed) ? w.data.failed.length : 0)} refused.`,
  },
  'step.code-refused': {
    family: 'steps',
    name: 'Code refused',
    sentence: (w) => `${w.Participant} typed a code for the step ${w.step} that does not match.`,
  },
  'step.return-refused': {
    family: 'steps',
    name: 'Return link refused',
    sentence: (w) =>
      `A return link${w.data.reference ? ` for participant ${String(w.data.reference)}` : ''} was refused: ${RETURN_REFUSALS[String(w.data.reason)] ?? 'it could not be checked'}.`,
  },
  // ── messages ──
  'contact.message-sent': {
    family: 'contact',
    name: 'Message sent',
    sentence: (w) => `${w.who} sent ${w.participant} a message, ${quoted(w.data.subject)}.`,
  },
  // ── dropout watch ──
  'attrition.alerts-updated': {
    family: 'watch',
    name: 'Dropout alerts set',
    sentence: (w) => `${w.who} changed the dropout alerts.`,
  },
  'attrition.alert-sent': {
    family: 'watch',
    name: 'Dropout alert sent',
    sentence: (w) =>
      `A dropout alert went to ${plural(Array.isArray(w.data.recipients) ? w.data.recipients.length : 0, 'person', 'people')}: ${String(w.data.summary ?? 'a threshold was crossed')}`.replace(
        /([^.])$/,
        '$1.',
      ),
  },
  // ── payouts ──
  'payout.approved': {
    family: 'payouts',
    name: 'Payouts approved',
    sentence: (w) => `${w.who} approved ${plural(w.data.count, 'payout')}, ${w.money(w.data.amountMinor)} in all.`,
    amountMinor: (w) => numberOrNull(w.data.amountMinor),
  },
  'payout.retried': {
    family: 'payouts',
    name: 'Payout sent again',
    sentence: (w) =>
      `${w.who} sent ${w.money(w.context.payoutAmountMinor)} to ${w.participant} again after it was not sent.`,
    amountMinor: payoutAmount,
  },
  'payout.delivered': {
    family: 'payouts',
    name: 'Paid',
    sentence: (w) => `${w.money(payoutAmount(w))} reached ${w.participant}’s payout account.`,
    amountMinor: payoutAmount,
  },
  'payout.undelivered': {
    family: 'payouts',
    name: 'Payout not sent',
    sentence: (w) =>
      `${w.money(payoutAmount(w))} for ${w.participant} could not be sent${w.data.reason ? `: ${String(w.data.reason).replace(/\.$/, '')}` : ''}.`,
    amountMinor: payoutAmount,
  },
  'payout.returned': {
    family: 'payouts',
    name: 'Payment taken back',
    sentence: (w) =>
      `${w.money(payoutAmount(w))} paid to ${w.participant} came back from their payout account${w.data.owedAgainAs ? ' and is owed again' : ''}.`,
    amountMinor: payoutAmount,
  },
  // ── funding ──
  'funding.started': {
    family: 'funding',
    name: 'Funding started',
    sentence: (w) => `${w.who} started adding ${w.money(w.data.amountMinor)} to the study’s balance by card.`,
    amountMinor: (w) => numberOrNull(w.data.amountMinor),
  },
  'funding.received': {
    family: 'funding',
    name: 'Funding received',
    sentence: (w) => `${w.money(w.data.amountMinor)} was added to the study’s balance.`,
    amountMinor: (w) => numberOrNull(w.data.amountMinor),
  },
  'funding.declined': {
    family: 'funding',
    name: 'Funding declined',
    sentence: (w) => `A card payment of ${w.money(w.data.amountMinor)} to the study’s balance was declined.`,
    amountMinor: (w) => numberOrNull(w.data.amountMinor),
  },
  // ── exports ──
  'study.exported': {
    family: 'exports',
    name: 'Data set exported',
    sentence: (w) =>
      `${w.who} exported the study’s data set as CSV${w.data.blinded ? ', with conditions masked' : ''}.`,
  },
  // ── audit receipts ──
  'audit.receipt-issued': {
    family: 'audit-receipts',
    name: 'Audit receipt sealed',
    sentence: (w) =>
      `${w.who} sealed audit receipt no. ${String(w.data.number ?? '?')}, covering ${plural(w.data.chains, 'chain')}.`,
  },
  'audit.unkeyed-events-sealed': {
    family: 'audit-receipts',
    name: 'Earlier events sealed',
    sentence: (w) =>
      `Evenhand sealed the ${plural(w.data.unkeyedThrough, 'event')} written before the trail was keyed.`,
  },
};

/**
 * Codes written by earlier versions, read as the action they meant. Two of them spelled the payment provider's own
 * event types; the api now writes its own codes, and these stay only so old events still read well.
 */
export const EARLIER_ACTION_CODES: Record<string, string> = {
  'payout.paid': 'payout.delivered',
  'payout.failed': 'payout.undelivered',
  'payout.reversed': 'payout.returned',
  'funding.succeeded': 'funding.received',
  'funding.failed': 'funding.declined',
};

function capitalized(sentence: string): string {
  return sentence.charAt(0).toUpperCase() + sentence.slice(1);
}

function listKeys(value: unknown): Array<[string, true]> {
  return Array.isArray(value) ? value.map((key) => [String(key), true]) : [];
}

function lower(phrase: string): string {
  // "Coordinator C. Vasquez-Hale" inside a sentence: the role word lower-cased, the name kept.
  return phrase.replace(/^(Lab admin|Coordinator|Researcher|Auditor|Participant|Someone|Evenhand)\b/, (word) =>
    word === 'Evenhand' ? word : word.toLowerCase(),
  );
}

/** The action words for a code, following earlier codes to the one they meant. */
export function actionWords(action: string): ActionWords | null {
  return AUDIT_ACTIONS[action] ?? AUDIT_ACTIONS[EARLIER_ACTION_CODES[action] ?? ''] ?? null;
}

/** The family of an action code ('other' for codes this version has no words for). */
export function familyOf(action: string): ActionFamily {
  return actionWords(action)?.family ?? 'other';
}

/** Every code, current and earlier, in the given families (for filtering the stored events). */
export function actionsInFamilies(families: readonly ActionFamily[]): string[] {
  const wanted = new Set(families);
  return [...Object.keys(AUDIT_ACTIONS), ...Object.keys(EARLIER_ACTION_CODES)].filter((code) =>
    wanted.has(familyOf(code)),
  );
}

/** Every code this version has words for. */
export function knownActionCodes(): string[] {
  return [...Object.keys(AUDIT_ACTIONS), ...Object.keys(EARLIER_ACTION_CODES)];
}

function actorPhrase(event: SentenceEvent, context: SentenceContext): string {
  if (context.actorIsParticipant)
    return context.participantReference ? `Participant ${context.participantReference}` : 'A participant';
  if (context.actor) return context.actor.role === 'participant' ? 'A participant' : personPhrase(context.actor);
  if (event.actorEmail) return event.actorEmail;
  return 'Evenhand';
}

/** One event in words: its family, our name for the action and the sentence. */
export function describeEvent(event: SentenceEvent, context: SentenceContext): EventInWords {
  const words = actionWords(event.action);
  const reference = context.participantReference;
  const w: Words = {
    who: actorPhrase(event, context),
    participant: reference ? `participant ${reference}` : 'a participant',
    Participant: reference ? `Participant ${reference}` : 'A participant',
    step: context.stepTitle ? quoted(context.stepTitle) : 'that is no longer listed',
    money: (minor) =>
      typeof minor === 'number' && Number.isFinite(minor) ? formatAmount(minor, context.currency) : 'an amount',
    data: event.data ?? {},
    event,
    context,
  };
  if (!words) {
    return {
      family: 'other',
      name: 'Other event',
      sentence: `${w.who} recorded an event this version of Evenhand has no words for; its details show what was stored.`,
      amount: null,
    };
  }
  const amountMinor = words.amountMinor?.(w) ?? null;
  return {
    family: words.family,
    name: words.name,
    sentence: capitalized(words.sentence(w)),
    amount: amountMinor !== null && context.currency ? { minor: amountMinor, currency: context.currency.trim() } : null,
  };
}
