import { addDays, type StepWindow } from '../steps';

/**
 * One rule of a study's reminder plan: a number of days after a step opens, or before it is due. The plan is the
 * same for every participant by construction: nothing a planner reads depends on the condition.
 */
export interface ReminderRule {
  anchor: 'opens' | 'due';
  /** Days after opening (anchor `opens`) or before the due date (anchor `due`). */
  days: number;
}

export const DEFAULT_REMINDER_RULES: ReminderRule[] = [
  { anchor: 'opens', days: 0 },
  { anchor: 'due', days: 2 },
  { anchor: 'due', days: 0 },
];

export interface PlannedReminder {
  stepId: string;
  /** Stable per enrollment, step and rule, so a reminder is sent once however often the sweep runs. */
  dedupeKey: string;
  rule: ReminderRule;
  sendAt: Date;
}

export function ruleKey(rule: ReminderRule): string {
  return rule.anchor === 'opens' ? `opens+${rule.days}` : `due-${rule.days}`;
}

/** The part of an enrollment the planner may read; the condition is deliberately not part of it. */
export interface ReminderSubject {
  windows: readonly StepWindow[];
  doneStepIds: ReadonlySet<string>;
}

/**
 * Every reminder one participant is owed, for steps not yet done: each rule gives one moment per step. A rule that
 * falls before the step opens (a "2 days before due" on a one-day window) or that needs a due date the step lacks
 * gives none.
 */
export function planReminders(rules: readonly ReminderRule[], subject: ReminderSubject): PlannedReminder[] {
  const planned: PlannedReminder[] = [];
  for (const window of subject.windows) {
    if (subject.doneStepIds.has(window.stepId) || !window.opensAt) continue;
    for (const rule of rules) {
      const sendAt =
        rule.anchor === 'opens'
          ? addDays(window.opensAt, rule.days)
          : window.dueAt
            ? addDays(window.dueAt, -rule.days)
            : null;
      if (!sendAt || sendAt < window.opensAt || (window.dueAt && sendAt > window.dueAt)) continue;
      planned.push({ stepId: window.stepId, dedupeKey: `reminder:${window.stepId}:${ruleKey(rule)}`, rule, sendAt });
    }
  }
  return planned.sort((a, b) => a.sendAt.getTime() - b.sendAt.getTime() || a.dedupeKey.localeCompare(b.dedupeKey));
}

/** Reminders due at `now`; ones more than `staleAfterDays` overdue are dropped rather than sent late in a burst. */
export function remindersDue(planned: readonly PlannedReminder[], now: Date, staleAfterDays = 3): PlannedReminder[] {
  const oldest = addDays(now, -staleAfterDays);
  return planned.filter((r) => r.sendAt <= now && r.sendAt >= oldest);
}
