import { describe, expect, it } from 'vitest';
import { survivalAt, toStepPoints, type KaplanMeierPoint } from './survival-steps';

// Freireich et al. (1963), 6-MP arm: Kaplan–Meier estimates at the event times 6, 7, 10, 13, 16, 22, 23 are
// 0.8571, 0.8067, 0.7529, 0.6902, 0.6275, 0.5378, 0.4482 (printed in most survival-analysis texts, e.g. Kleinbaum & Klein).
const sixMp: KaplanMeierPoint[] = [
  [6, 0.8571, 21, 3],
  [7, 0.8067, 17, 1],
  [10, 0.7529, 15, 1],
  [13, 0.6902, 12, 1],
  [16, 0.6275, 11, 1],
  [22, 0.5378, 7, 1],
  [23, 0.4482, 6, 1],
].map(([time, survival, atRisk, events]) => ({
  time: time!,
  survival: survival!,
  lower: null,
  upper: null,
  atRisk: atRisk!,
  events: events!,
}));

describe('toStepPoints', () => {
  it('starts at 1 on day 0 and keeps every published step', () => {
    const steps = toStepPoints(sixMp);
    expect(steps[0]).toMatchObject({ time: 0, survival: 1 });
    expect(steps.map((step) => step.survival)).toEqual([1, 0.8571, 0.8067, 0.7529, 0.6902, 0.6275, 0.5378, 0.4482]);
  });

  it('reads the curve as a right-continuous step: the value holds until the next event', () => {
    const steps = toStepPoints(sixMp);
    expect(survivalAt(steps, 5)).toBe(1);
    expect(survivalAt(steps, 6)).toBe(0.8571);
    expect(survivalAt(steps, 9)).toBe(0.8067);
    expect(survivalAt(steps, 30)).toBe(0.4482);
  });

  it('shows a drop on day 0 as a step from 1', () => {
    const steps = toStepPoints([{ time: 0, survival: 0.9375, lower: null, upper: null, atRisk: 16, events: 1 }]);
    expect(steps.map((step) => [step.time, step.survival])).toEqual([
      [0, 1],
      [0, 0.9375],
    ]);
  });

  it('does not repeat a day-0 point that is already 1', () => {
    const steps = toStepPoints([{ time: 0, survival: 1, lower: 1, upper: 1, atRisk: 15, events: 0 }, sixMp[0]!]);
    expect(steps.map((step) => step.time)).toEqual([0, 6]);
  });

  it('refuses survival outside [0, 1] and times that go backwards, naming the point', () => {
    expect(() => toStepPoints([{ ...sixMp[0]!, survival: 1.2 }])).toThrow(/points\[0\]\.survival/);
    expect(() => toStepPoints([sixMp[1]!, sixMp[0]!])).toThrow(/points\[1\]\.time/);
  });
});
