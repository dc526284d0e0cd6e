import type { EnrollmentStatus } from '../api/get-roster';

// The enrollment flow (DESIGN.md): invited → screened → excluded | consented → assigned → active → completed | withdrew | lost.
// The api refuses the same moves (EnrollmentsService.markLost / withdraw).

/** Only someone assigned who has not finished can be lost to follow-up. */
export function mayMarkLost(status: EnrollmentStatus): boolean {
  return status === 'assigned' || status === 'active';
}

/** Only someone marked lost to follow-up can be put back to taking part (FollowUpService.undoLost). */
export function mayUndoLost(status: EnrollmentStatus): boolean {
  return status === 'lost';
}

/** Anyone still on the way can withdraw, a lost participant included; finished, excluded or withdrawn people cannot. */
export function mayRecordWithdrawal(status: EnrollmentStatus): boolean {
  return !['completed', 'excluded', 'withdrew'].includes(status);
}
