import { formatDateTime } from '@/lib/date-format';
import type { EnrollmentStep } from '../api/get-my-enrollment';

export type StepStatus = EnrollmentStep['status'];

/** The short label on each step; the sentence beside it (stepWindowWords) says the rest. */
export const stepStatusWords: Record<StepStatus, string> = {
  done: 'Done',
  open: 'Ready for you',
  overdue: 'Overdue',
  upcoming: 'Not open yet',
  waiting: 'Not open yet',
  locked: 'On hold',
};

/** Steps the participant can do now: an overdue one is past its date but still accepted. */
export function canDoNow(step: Pick<EnrollmentStep, 'status'>): boolean {
  return step.status === 'open' || step.status === 'overdue';
}

/**
 * When the step can be done, in plain words ("Do it by …", "Opens on …"), or null when there is nothing to say
 * (a done step shows when it was done instead). Times carry their zone: a deadline means little without it.
 */
export function stepWindowWords(step: Pick<EnrollmentStep, 'status' | 'opensAt' | 'dueAt'>): string | null {
  const dueBy = step.dueAt ? `Do it by ${formatDateTime(step.dueAt)}.` : null;
  switch (step.status) {
    case 'done':
      return null;
    case 'open':
      return dueBy ?? 'Open now, with no deadline.';
    case 'overdue':
      return step.dueAt
        ? `Overdue since ${formatDateTime(step.dueAt)}, but you can still do it.`
        : 'Past its date, but you can still do it.';
    case 'upcoming':
      return [step.opensAt ? `Opens on ${formatDateTime(step.opensAt)}.` : 'Opens later.', dueBy]
        .filter(Boolean)
        .join(' ');
    case 'waiting':
      return 'Opens after you finish the previous step.';
    case 'locked':
      return 'You cannot do this step just now.';
  }
}

/**
 * How a step that is not done yet gets done, when no button or form on screen already says it: staff-marked sessions,
 * and task or code steps that have not opened yet.
 */
export function stepHowWords(
  step: Pick<EnrollmentStep, 'status' | 'verification' | 'hasTask' | 'hasCompletionCode'>,
): string | null {
  if (step.status === 'done' || step.status === 'locked') return null;
  if (step.verification === 'staff') {
    return 'The research team marks this step done after your session. There is nothing for you to enter here.';
  }
  const now = canDoNow(step);
  if (step.hasTask) {
    return now ? null : 'You do this step in an online task. The button to open it appears here once the step opens.';
  }
  if (step.hasCompletionCode) {
    return now ? null : 'At the end of this step you are given a code. Once the step opens, you enter it here.';
  }
  if (step.verification === 'return-link') {
    return 'The link to this step’s online task is not ready yet. Please look again later, or ask the research team.';
  }
  return 'There is no code to enter for this step: the research team marks it done once they have your results.';
}
