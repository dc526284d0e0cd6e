import type { components } from '@evenhand/contract';

type StepDto = components['schemas']['StepDto'];
export type StepVerification = StepDto['verification'];
export type StepOpensFrom = StepDto['opensFrom'];

/** How a step's completion is checked, in the words the set-up screen uses. */
export const verificationWording: Record<StepVerification, { label: string; description: string; short: string }> = {
  'return-link': {
    label: 'Return link from an external task',
    short: 'Return link',
    description:
      'Participants start the task from Evenhand; at its end your task sends them to a signed return address, which marks the step done.',
  },
  'participant-code': {
    label: 'A code for each participant',
    short: 'Own code',
    description:
      'Each participant gets a code of their own (staff see it on the record); typing it marks the step done.',
  },
  'shared-code': {
    label: 'One code for the whole step',
    short: 'Shared code',
    description: 'Everyone types the same code, e.g. shown on the last page of a task or said at the end of a session.',
  },
  staff: {
    label: 'Marked done by staff',
    short: 'Staff',
    description: 'A coordinator marks the step done, one person at a time or from a list; for sessions in the lab.',
  },
};

export const verificationOrder: readonly StepVerification[] = [
  'return-link',
  'participant-code',
  'shared-code',
  'staff',
];

function days(count: number): string {
  return `${count} ${count === 1 ? 'day' : 'days'}`;
}

/** The step's window in one line, e.g. "Opens 7 days after the previous step · due within 3 days". */
export function windowSentence(step: {
  opensAfterDays: number;
  opensFrom: StepOpensFrom;
  dueWithinDays: number | null;
}): string {
  const from = step.opensFrom === 'assignment' ? 'assignment' : 'the previous step is done';
  const opens = step.opensAfterDays === 0 ? `Opens at ${from}` : `Opens ${days(step.opensAfterDays)} after ${from}`;
  const due =
    step.dueWithinDays === null
      ? 'no due date'
      : step.dueWithinDays === 0
        ? 'due the day it opens'
        : `due within ${days(step.dueWithinDays)}`;
  return `${opens} · ${due}`;
}
