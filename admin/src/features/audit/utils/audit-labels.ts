/** The actions the api records (api/src/*), grouped for the filter, in plain words. */
export const auditActionGroups: { group: string; actions: { action: string; label: string }[] }[] = [
  {
    group: 'Sign-in',
    actions: [
      { action: 'auth.signed-in', label: 'Signed in' },
      { action: 'auth.sign-in-failed', label: 'Sign-in failed' },
      { action: 'auth.signed-out', label: 'Signed out' },
      { action: 'auth.refresh-reuse-detected', label: 'Stolen session suspected' },
    ],
  },
  {
    group: 'Staff',
    actions: [
      { action: 'user.created', label: 'Staff account created' },
      { action: 'user.updated', label: 'Staff account changed' },
      { action: 'user.deactivated', label: 'Staff account deactivated' },
      { action: 'study.member-added', label: 'Study member added' },
    ],
  },
  {
    group: 'Study set-up',
    actions: [
      { action: 'study.created', label: 'Study created' },
      { action: 'study.updated', label: 'Study changed' },
      { action: 'study.opened', label: 'Study opened' },
      { action: 'study.paused', label: 'Study paused' },
      { action: 'study.closed', label: 'Study closed' },
      { action: 'condition.created', label: 'Condition added' },
      { action: 'condition.updated', label: 'Condition changed' },
      { action: 'step.created', label: 'Step added' },
      { action: 'step.updated', label: 'Step changed' },
      { action: 'step.pay-override-recorded', label: 'Pay override recorded' },
      { action: 'step.pay-override-removed', label: 'Pay override removed' },
      { action: 'screening.replaced', label: 'Screening questions replaced' },
      { action: 'stratification.replaced', label: 'Stratification replaced' },
    ],
  },
  {
    group: 'Assignment',
    actions: [
      { action: 'assignment.scheme-saved', label: 'Assignment scheme saved' },
      { action: 'assignment.committed', label: 'Sequence committed' },
      { action: 'assignment.allocated', label: 'Participant assigned' },
      { action: 'assignment.unblinded', label: 'Study unblinded' },
      { action: 'assignment.seed-revealed', label: 'Seed revealed' },
    ],
  },
  {
    group: 'Consent',
    actions: [
      { action: 'consent.draft-created', label: 'Consent draft created' },
      { action: 'consent.draft-updated', label: 'Consent draft edited' },
      { action: 'consent.approval-letter-uploaded', label: 'Approval letter uploaded' },
      { action: 'consent.activated', label: 'Consent version activated' },
      { action: 'consent.retired', label: 'Consent version retired' },
      { action: 'consent.reconsent-requested', label: 'Re-consent requested' },
      { action: 'consent.reconsent-reminded', label: 'Re-consent reminder sent' },
      { action: 'consent.signed', label: 'Consent signed' },
      { action: 'consent.re-signed', label: 'New consent version signed' },
    ],
  },
  {
    group: 'Roster',
    actions: [
      { action: 'roster.imported', label: 'Roster imported' },
      { action: 'roster.invited', label: 'Invitations sent' },
      { action: 'enrollment.joined', label: 'Participant joined' },
      { action: 'enrollment.screened', label: 'Participant screened' },
      { action: 'enrollment.excluded', label: 'Participant excluded' },
      { action: 'enrollment.withdrew', label: 'Participant withdrew' },
      { action: 'enrollment.lost', label: 'Lost to follow-up' },
    ],
  },
];

const labels = new Map(auditActionGroups.flatMap((group) => group.actions.map((entry) => [entry.action, entry.label] as const)));

/** An action in plain words; one the list does not know reads as its code turned into a phrase. */
export function auditActionLabel(action: string): string {
  const known = labels.get(action);
  if (known) return known;
  const phrase = action.replace(/[.-]+/g, ' ').trim();
  return phrase.charAt(0).toUpperCase() + phrase.slice(1);
}

export const labChain = 'lab';

/** A chain as staff know it: the study's title, or "Lab-wide" for events outside any study. */
export function chainLabel(chain: string, studyTitles: ReadonlyMap<string, string>): string {
  if (chain === labChain) return 'Lab-wide';
  return studyTitles.get(chain) ?? `Study ${chain.slice(0, 8)}`;
}
