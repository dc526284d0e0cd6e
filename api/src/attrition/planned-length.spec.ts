import { describe, expect, it } from 'vitest';
import { placebo, sixMp } from './freireich-1963.fixture';
import { kaplanMeier } from './kaplan-meier';
import { cumulativeDropoutAt, plannedStudyLength } from './planned-length';

describe('plannedStudyLength', () => {
  it('is the last due day when every step is done on its due day, chaining steps that open after the previous one', () => {
    expect(
      plannedStudyLength([
        { opensAfterDays: 0, opensFrom: 'assignment', dueWithinDays: 2 },
        { opensAfterDays: 7, opensFrom: 'previous-step', dueWithinDays: 3 },
        { opensAfterDays: 5, opensFrom: 'assignment', dueWithinDays: 1 },
      ]),
    ).toEqual({ days: 12, unknown: null }); // 0 + 2, then 2 + 7 + 3 = 12, then 5 + 1 = 6
  });

  it('is unknown without steps or when a step has no due date', () => {
    expect(plannedStudyLength([])).toEqual({ days: null, unknown: 'no-steps' });
    expect(plannedStudyLength([{ opensAfterDays: 0, opensFrom: 'assignment', dueWithinDays: null }])).toEqual({
      days: null,
      unknown: 'a-step-has-no-due-date',
    });
  });

  it('names the field of bad input', () => {
    expect(() => plannedStudyLength([{ opensAfterDays: -1, opensFrom: 'assignment', dueWithinDays: 2 }])).toThrow(
      /steps\[0\]\.opensAfterDays/,
    );
  });
});

describe('cumulativeDropoutAt', () => {
  it('reads 1 − S(t) off the Kaplan–Meier curve (Freireich 1963)', () => {
    // Source: Kleinbaum & Klein, Survival Analysis, KM table of the remission data: 6-MP S(10) = 0.753; placebo
    // S(8) = 8/21 = 0.381 (no censoring). Between event times the curve is flat, so day 9 reads the day-8 step.
    const mp = cumulativeDropoutAt(kaplanMeier(sixMp), 10);
    expect(mp?.cumulative as number).toBeCloseTo(1 - 0.753, 3);
    const control = cumulativeDropoutAt(kaplanMeier(placebo), 9);
    expect(control?.cumulative as number).toBeCloseTo(13 / 21, 12);
    // The band turns over: the lower limit of dropout is 1 − the upper limit of survival.
    const curve = kaplanMeier(placebo);
    const at8 = curve.steps.find((step) => step.time === 8)!;
    expect(control?.lower).toBeCloseTo(1 - (at8.upper as number), 12);
    expect(control?.upper).toBeCloseTo(1 - (at8.lower as number), 12);
  });

  it('is 0 before the first dropout, and null where follow-up does not reach the day yet', () => {
    expect(cumulativeDropoutAt(kaplanMeier(sixMp), 3)).toEqual({ cumulative: 0, lower: 0, upper: 0 });
    expect(cumulativeDropoutAt(kaplanMeier(sixMp), 36)).toBeNull(); // longest 6-MP follow-up is 35 weeks, censored
    expect(cumulativeDropoutAt(kaplanMeier([]), 5)).toBeNull();
  });
});
