import type { ReactNode } from 'react';
import type { ReturnRefusal } from '../utils/task-return';

type Explanation = { title: string; what: string; todo: string; askTeam?: boolean };

/** Plain words for each reason the api gives; never the reason's code itself. */
const explanations: Record<ReturnRefusal | 'other', Explanation> = {
  expired: {
    title: 'This link back from the task has expired',
    what: 'For your safety, the link that brings you back from a task only works for a limited time, and this one ran out.',
    todo: 'Start the task again from the study page: it gives you a fresh link.',
  },
  'other-person': {
    title: 'This link belongs to someone else',
    what: 'The task sent back a link made for another participant, so we did not count it for you.',
    todo: 'If you share this device, sign out, sign in as yourself, then start the task again from your study page.',
  },
  'not-open': {
    title: 'This step is not open yet',
    what: 'The task was finished before the step opened, so we could not count it yet.',
    todo: 'Your study page says when the step opens. Once it is open, start the task again from there.',
  },
  consent: {
    title: 'Please sign the new consent form first',
    what: 'The study’s consent form has changed since you started, and steps count only once you have agreed to the new version.',
    todo: 'Read and sign the new form on the study page, then start the task again from there.',
  },
  'not-taking-part': {
    title: 'You are not taking part in this study just now',
    what: 'Steps count only while you take part. Perhaps you stopped taking part, or every step was already done.',
    todo: 'Your study page shows where you stand.',
    askTeam: true,
  },
  forged: {
    title: 'This link was changed',
    what: 'The link back from the task does not match the one we made, so we could not count it. This happens when an address is edited, or copied with a mistake.',
    todo: 'Start the task again from your study page.',
    askTeam: true,
  },
  malformed: {
    title: 'This link is incomplete',
    what: 'Part of the link back from the task is missing, often because it was copied only in part.',
    todo: 'Start the task again from your study page.',
    askTeam: true,
  },
  other: {
    title: 'We could not count this step',
    what: 'Something about the link back from the task was not right.',
    todo: 'Your study page shows whether the step is done; if it is not, start the task again from there.',
    askTeam: true,
  },
};

type ReturnRefusalProps = {
  reason: ReturnRefusal | 'other';
  studyTitle?: string | null | undefined;
  contactEmail?: string | null | undefined;
  /** What to do next: links and buttons the route chooses (sign in, the study page…). */
  actions: ReactNode;
};

/** Why a return from the lab's task was not counted, and what to do about it. */
export function ReturnRefusalExplained({ reason, studyTitle, contactEmail, actions }: ReturnRefusalProps) {
  const explanation = explanations[reason];
  return (
    <section aria-labelledby="return-refused-heading" className="flex flex-col gap-5">
      <title>{`${explanation.title} · Evenhand`}</title>
      <div className="flex flex-col gap-3">
        <p className="text-fine font-semibold tracking-wide text-clay-ink uppercase">
          {studyTitle ?? 'Back from the task'}
        </p>
        <h1 id="return-refused-heading" className="text-title font-bold">
          {explanation.title}
        </h1>
      </div>
      <p className="text-lead">{explanation.what}</p>
      <p className="rounded-soft border-l-4 border-sand-deep bg-sand px-4 py-3">
        <strong>Nothing was marked done.</strong> {explanation.todo}
      </p>
      {explanation.askTeam ? (
        <p>
          If it keeps happening, please tell the research team
          {contactEmail ? (
            <>
              {' '}
              at{' '}
              <a
                href={`mailto:${contactEmail}`}
                className="font-semibold wrap-anywhere text-clay-ink underline decoration-2 underline-offset-4"
              >
                {contactEmail}
              </a>
            </>
          ) : null}
          .
        </p>
      ) : null}
      <div className="flex flex-col gap-3">{actions}</div>
    </section>
  );
}
