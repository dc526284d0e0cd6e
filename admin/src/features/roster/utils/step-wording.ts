import type { BadgeTone } from '@/components/ui/badge';
import type { components } from '@evenhand/contract';

type RecordStep = components['schemas']['RecordStepDto'];
type RecordCompletion = components['schemas']['RecordCompletionDto'];
type NextStep = components['schemas']['RosterNextStepDto'];

/** A step's status for one participant, in plain words. */
export const stepStatusWording: Record<RecordStep['status'], { label: string; tone: BadgeTone; explanation: string }> =
  {
    done: { label: 'Done', tone: 'success', explanation: 'Done and owed its pay.' },
    open: { label: 'Open now', tone: 'spruce', explanation: 'Can be done now.' },
    overdue: {
      label: 'Overdue',
      tone: 'danger',
      explanation: 'Past its due date; it can still be done and still counts.',
    },
    upcoming: { label: 'Opens later', tone: 'neutral', explanation: 'Opens on a set day.' },
    waiting: { label: 'Waiting', tone: 'neutral', explanation: 'Opens once the step before it is done.' },
    locked: {
      label: 'Not available',
      tone: 'caution',
      explanation: 'Not taking part now, or a new consent form has to be signed first.',
    },
  };

/** Where the roster's next step stands. */
export const nextStepTimingWording: Record<NextStep['timing'], { label: string; tone: BadgeTone }> = {
  open: { label: 'Due now', tone: 'spruce' },
  overdue: { label: 'Overdue', tone: 'danger' },
  upcoming: { label: 'Opens later', tone: 'neutral' },
  waiting: { label: 'Waiting', tone: 'neutral' },
};

/** How a completion was checked. */
export const verifiedByWording: Record<RecordCompletion['verifiedBy'], string> = {
  'return-link': 'Return link from the external task',
  'participant-code': 'The participant’s own code',
  'shared-code': 'The step’s shared code',
  staff: 'Marked done by staff',
  'staff-list': 'Marked done by staff from a list',
};

/** How a step is checked, short, for the record's step list. */
export const verificationWording: Record<RecordStep['verification'], string> = {
  'return-link': 'Return link',
  'participant-code': 'Own code',
  'shared-code': 'Shared code',
  staff: 'Marked by staff',
};

export const payoutStatusWording: Record<string, { label: string; tone: BadgeTone }> = {
  owed: { label: 'Pay owed', tone: 'caution' },
  approved: { label: 'Pay approved', tone: 'spruce' },
  sending: { label: 'Pay sending', tone: 'spruce' },
  paid: { label: 'Paid', tone: 'success' },
  failed: { label: 'Payment failed', tone: 'danger' },
  cancelled: { label: 'Pay cancelled', tone: 'neutral' },
  reversed: { label: 'Payment reversed', tone: 'danger' },
};

/** Why undo is not offered on a completion; null when it is. */
export function undoUnavailableReason(completion: RecordCompletion): string | null {
  if (completion.canUndo) return null;
  return 'Its pay has been approved, so it can no longer be undone: undoing would take back money already on its way. If it was recorded by mistake, note it in the audit trail and talk to whoever approves payouts.';
}
