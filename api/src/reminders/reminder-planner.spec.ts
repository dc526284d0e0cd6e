import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { stepWindows, type StepSchedule } from '../steps/step-window';
import { DEFAULT_REMINDER_RULES, planReminders, remindersDue, type ReminderRule } from './reminder-planner';

const steps: StepSchedule[] = [
  { id: 's1', opensAfterDays: 0, opensFrom: 'assignment', dueWithinDays: 3 },
  { id: 's2', opensAfterDays: 7, opensFrom: 'previous-step', dueWithinDays: 1 },
  { id: 's3', opensAfterDays: 21, opensFrom: 'assignment', dueWithinDays: null },
];
const assignedAt = new Date('2026-02-02T08:00:00Z');

describe('planReminders', () => {
  it('plans the default rules per open step, skipping moments outside the window and rules without a due date', () => {
    const windows = stepWindows(steps, assignedAt, new Map([['s1', new Date('2026-02-03T08:00:00Z')]]));
    const planned = planReminders(DEFAULT_REMINDER_RULES, { windows, doneStepIds: new Set(['s1']) });
    expect(planned.map((r) => [r.dedupeKey, r.sendAt.toISOString()])).toEqual([
      ['reminder:s2:opens+0', '2026-02-10T08:00:00.000Z'],
      ['reminder:s2:due-0', '2026-02-11T08:00:00.000Z'],
      ['reminder:s3:opens+0', '2026-02-23T08:00:00.000Z'],
    ]);
  });

  it('sends what is due now and drops what is long past', () => {
    const windows = stepWindows(steps, assignedAt, new Map());
    const planned = planReminders(DEFAULT_REMINDER_RULES, { windows, doneStepIds: new Set() });
    expect(remindersDue(planned, new Date('2026-02-03T09:00:00Z')).map((r) => r.dedupeKey)).toEqual([
      'reminder:s1:opens+0',
      'reminder:s1:due-2',
    ]);
    expect(remindersDue(planned, new Date('2026-02-20T09:00:00Z')).map((r) => r.dedupeKey)).toEqual([]);
  });

  // The property the dropout watch relies on: two people who arrive at the same moment and progress alike get the
  // same reminders, whatever condition each was assigned to.
  it('gives identical schedules in every condition for any plan and arrival', () => {
    const rule = fc.record({
      anchor: fc.constantFrom<'opens' | 'due'>('opens', 'due'),
      days: fc.integer({ min: 0, max: 14 }),
    });
    const step = fc.record({
      opensAfterDays: fc.integer({ min: 0, max: 30 }),
      opensFrom: fc.constantFrom<'assignment' | 'previous-step'>('assignment', 'previous-step'),
      dueWithinDays: fc.option(fc.integer({ min: 0, max: 14 }), { nil: null }),
    });
    fc.assert(
      fc.property(
        fc.array(rule, { maxLength: 5 }),
        fc.array(step, { minLength: 1, maxLength: 5 }),
        fc.date({ min: new Date('2025-01-01T00:00:00Z'), max: new Date('2028-01-01T00:00:00Z'), noInvalidDate: true }),
        fc.array(fc.integer({ min: 0, max: 40 }), { maxLength: 5 }),
        fc.constantFrom('condition-a', 'condition-b', 'condition-c'),
        (rules: ReminderRule[], shapes, arrival, doneAfterDays, conditionId) => {
          const schedule = shapes.map((s, i) => ({ ...s, id: `step-${i}` }));
          const completions = new Map(
            doneAfterDays
              .slice(0, schedule.length)
              .map((d, i) => [`step-${i}`, new Date(arrival.getTime() + d * 86_400_000)]),
          );
          const plannedFor = (enrollment: { conditionId: string }) =>
            planReminders(rules, {
              windows: stepWindows(schedule, arrival, completions),
              doneStepIds: new Set(completions.keys()),
              ...{ conditionId: enrollment.conditionId },
            });
          const reference = plannedFor({ conditionId: 'condition-a' });
          expect(plannedFor({ conditionId })).toEqual(reference);
        },
      ),
      { numRuns: 300 },
    );
  });
});
