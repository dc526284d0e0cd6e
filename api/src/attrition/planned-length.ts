import { AttritionInputError, requireCount } from './attrition-input-error';
import type { KaplanMeierCurve } from './kaplan-meier';

/** One step of the study's schedule, in order (as StepSchedule in the steps domain). */
export interface PlannedStep {
  opensAfterDays: number;
  opensFrom: 'assignment' | 'previous-step';
  /** Null: the step has no due date. */
  dueWithinDays: number | null;
}

export type PlannedLengthUnknown = 'no-steps' | 'a-step-has-no-due-date';

/**
 * The planned study length in days since assignment: the last due day of the schedule when every step is done on
 * its due day (the longest anyone can take without missing a due date). Unknown when there are no steps or some
 * step has no due date, since then the schedule sets no end.
 */
export function plannedStudyLength(
  steps: readonly PlannedStep[],
  field = 'steps',
): { days: number | null; unknown: PlannedLengthUnknown | null } {
  if (steps.length === 0) return { days: null, unknown: 'no-steps' };
  let previousDue = 0;
  let longest = 0;
  for (const [index, step] of steps.entries()) {
    requireCount(step.opensAfterDays, `${field}[${index}].opensAfterDays`);
    if (step.opensFrom !== 'assignment' && step.opensFrom !== 'previous-step') {
      throw new AttritionInputError(`${field}[${index}].opensFrom`, 'must be "assignment" or "previous-step"');
    }
    if (step.dueWithinDays === null) return { days: null, unknown: 'a-step-has-no-due-date' };
    requireCount(step.dueWithinDays, `${field}[${index}].dueWithinDays`);
    const opens = (step.opensFrom === 'previous-step' ? previousDue : 0) + step.opensAfterDays;
    previousDue = opens + step.dueWithinDays;
    longest = Math.max(longest, previousDue);
  }
  return { days: longest, unknown: null };
}

export interface CumulativeDropout {
  /** 1 − S(t): the Kaplan–Meier share who dropped out by day t. */
  cumulative: number;
  /** 1 − the upper and lower limits of the curve's log-log band at t; null where the band is. */
  lower: number | null;
  upper: number | null;
}

/**
 * Cumulative dropout by day t read off a Kaplan–Meier curve: 1 − S(t), S being the step at the last time ≤ t.
 * Null when follow-up so far does not reach t (the curve is undefined past the longest follow-up), or nobody is in it.
 */
export function cumulativeDropoutAt(
  curve: Pick<KaplanMeierCurve, 'steps' | 'atStart'>,
  t: number,
): CumulativeDropout | null {
  if (curve.atStart === 0 || curve.steps.length === 0) return null;
  const last = curve.steps[curve.steps.length - 1];
  if (last.time < t && last.survival > 0) return null;
  let step: (typeof curve.steps)[number] | null = null;
  for (const candidate of curve.steps) {
    if (candidate.time > t) break;
    step = candidate;
  }
  if (step === null) return { cumulative: 0, lower: 0, upper: 0 };
  return {
    cumulative: 1 - step.survival,
    lower: step.upper === null ? null : 1 - step.upper,
    upper: step.lower === null ? null : 1 - step.lower,
  };
}
