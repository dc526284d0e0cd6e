/** How a step's completion is checked. */
export type StepVerification = 'return-link' | 'participant-code' | 'shared-code' | 'staff';
export const STEP_VERIFICATIONS: readonly StepVerification[] = [
  'return-link',
  'participant-code',
  'shared-code',
  'staff',
];
/** What a step's window counts from. */
export type StepOpensFrom = 'assignment' | 'previous-step';
/** How a recorded completion was verified; `staff-list` is a staff mark from a pasted or uploaded list. */
export type CompletionVerifiedBy = StepVerification | 'staff-list';

export interface StepSchedule {
  id: string;
  opensAfterDays: number;
  opensFrom: StepOpensFrom;
  /** Null: no due date. */
  dueWithinDays: number | null;
}

export interface StepWindow {
  stepId: string;
  /** Null while the step waits for the previous one to be done. */
  opensAt: Date | null;
  dueAt: Date | null;
}

/** Where a step stands for one participant at a moment. */
export type StepTiming = 'done' | 'waiting' | 'upcoming' | 'open' | 'overdue';

const DAY_MS = 24 * 60 * 60 * 1000;

export function addDays(at: Date, days: number): Date {
  return new Date(at.getTime() + days * DAY_MS);
}

/**
 * Each step's window for one participant, in step order: it opens a number of days after assignment or after the
 * previous step was done, and is due a number of days after it opens. Nothing here depends on the condition.
 */
export function stepWindows(
  steps: readonly StepSchedule[],
  assignedAt: Date,
  completedAt: ReadonlyMap<string, Date>,
): StepWindow[] {
  const windows: StepWindow[] = [];
  let previousDoneAt: Date | null = assignedAt;
  for (const step of steps) {
    const from = step.opensFrom === 'previous-step' ? previousDoneAt : assignedAt;
    const opensAt = from ? addDays(from, step.opensAfterDays) : null;
    const dueAt = opensAt && step.dueWithinDays !== null ? addDays(opensAt, step.dueWithinDays) : null;
    windows.push({ stepId: step.id, opensAt, dueAt });
    previousDoneAt = completedAt.get(step.id) ?? null;
  }
  return windows;
}

export function stepTiming(window: StepWindow, done: boolean, now: Date): StepTiming {
  if (done) return 'done';
  if (!window.opensAt) return 'waiting';
  if (now < window.opensAt) return 'upcoming';
  if (window.dueAt && now > window.dueAt) return 'overdue';
  return 'open';
}
