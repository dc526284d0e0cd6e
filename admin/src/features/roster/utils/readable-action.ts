// What the events on one participant's timeline mean, in plain words (actions recorded by api/src/enrollments and consent).
const timelineLabels: Record<string, string> = {
  'roster.imported': 'Added from a roster import',
  'roster.invited': 'Invitation e-mailed',
  'enrollment.joined': 'Joined the study',
  'enrollment.screened': 'Answered the screening questions',
  'enrollment.excluded': 'Excluded at screening',
  'assignment.allocated': 'Assigned to a condition',
  'consent.signed': 'Signed the consent form',
  'consent.re-signed': 'Signed a new consent version',
  'consent.signed-copy': 'Signed copy sent by e-mail',
  'consent.reconsent-requested': 'Asked to sign a new consent version',
  'consent.reconsent-reminded': 'Reminded to sign the new version',
  'enrollment.withdrew': 'Withdrew',
  'enrollment.lost': 'Marked lost to follow-up',
};

/** A timeline event in plain words; unknown codes read as "Step completed" from "step.completed". */
export function readableAction(action: string): string {
  const known = timelineLabels[action];
  if (known) return known;
  const phrase = action.replace(/[.-]+/g, ' ').trim();
  return phrase.charAt(0).toUpperCase() + phrase.slice(1);
}
