import { describe, expect, it } from 'vitest';
import { stepTiming, stepWindows, type StepSchedule } from './step-window';

const assignedAt = new Date('2026-03-02T09:00:00Z');
const steps: StepSchedule[] = [
  { id: 'a', opensAfterDays: 0, opensFrom: 'assignment', dueWithinDays: 2 },
  { id: 'b', opensAfterDays: 7, opensFrom: 'previous-step', dueWithinDays: 3 },
  { id: 'c', opensAfterDays: 28, opensFrom: 'assignment', dueWithinDays: null },
];

describe('stepWindows', () => {
  it('opens steps counted from assignment or from the previous step, and dates them due after opening', () => {
    const windows = stepWindows(steps, assignedAt, new Map([['a', new Date('2026-03-03T10:00:00Z')]]));
    expect(windows.map((w) => [w.stepId, w.opensAt?.toISOString() ?? null, w.dueAt?.toISOString() ?? null])).toEqual([
      ['a', '2026-03-02T09:00:00.000Z', '2026-03-04T09:00:00.000Z'],
      ['b', '2026-03-10T10:00:00.000Z', '2026-03-13T10:00:00.000Z'],
      ['c', '2026-03-30T09:00:00.000Z', null],
    ]);
  });

  it('leaves a step that counts from an unfinished previous step without an opening date', () => {
    const [, b] = stepWindows(steps, assignedAt, new Map());
    expect(b.opensAt).toBeNull();
    expect(stepTiming(b, false, new Date('2026-04-01T00:00:00Z'))).toBe('waiting');
  });

  it('reads upcoming, open, overdue and done', () => {
    const [a] = stepWindows(steps, assignedAt, new Map());
    expect(stepTiming(a, false, new Date('2026-03-01T00:00:00Z'))).toBe('upcoming');
    expect(stepTiming(a, false, new Date('2026-03-03T00:00:00Z'))).toBe('open');
    expect(stepTiming(a, false, new Date('2026-03-05T00:00:00Z'))).toBe('overdue');
    expect(stepTiming(a, true, new Date('2026-03-05T00:00:00Z'))).toBe('done');
  });
});
