import { useEffect, useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import { Notice } from '@/components/ui/notice';
import { formatDate } from '@/lib/date-format';
import { formatMinor } from '@/lib/money';
import type { EnrollmentStep, MyEnrollment } from '../api/get-my-enrollment';
import { canDoNow, stepHowWords, stepStatusWords, stepWindowWords } from '../utils/step-schedule';
import { OpenTaskButton } from './open-task-button';
import { StepCompletionForm } from './step-completion-form';

const statusClasses: Record<EnrollmentStep['status'], string> = {
  done: 'bg-moss-tint text-moss-ink',
  open: 'bg-clay-tint text-clay-ink',
  overdue: 'bg-ember-tint text-ember',
  upcoming: 'bg-sand text-ink-soft',
  waiting: 'bg-sand text-ink-soft',
  locked: 'bg-sand text-ink-soft',
};

type YourStepsProps = Pick<MyEnrollment, 'studyId' | 'steps' | 'currency' | 'earned'> & {
  contactEmail?: string | null | undefined;
  onNeedsReconsent?: () => void;
};

/**
 * The study's steps: where each stands, its window and pay, and on each one that can be done now the way to do it (the
 * lab's task, a code, or nothing to do while staff mark it); then what has been earned.
 */
export function YourSteps({ studyId, steps, currency, earned, contactEmail, onNeedsReconsent }: YourStepsProps) {
  const money = (minor: number) => formatMinor(minor, currency);
  const ordered = [...steps].sort((a, b) => a.position - b.position);
  const done = ordered.filter((step) => step.status === 'done').length;
  const [justCompletedId, setJustCompletedId] = useState<string | null>(null);

  return (
    <section aria-labelledby="your-steps-heading" className="flex flex-col gap-4">
      <div className="flex flex-col gap-1">
        <h2 id="your-steps-heading" className="text-heading font-bold">
          Your steps
        </h2>
        {ordered.length > 0 ? (
          <p className="text-ink-soft">
            {done} of {ordered.length} done
          </p>
        ) : null}
      </div>

      {ordered.length === 0 ? (
        <p className="rounded-soft bg-sand px-4 py-3">
          The research team has not set up the steps yet. They will appear here, and we will let you know.
        </p>
      ) : (
        <ol className="flex flex-col gap-3">
          {ordered.map((step, index) => {
            const headingId = `step-${step.id}-heading`;
            const windowWords = stepWindowWords(step);
            const how = stepHowWords(step);
            return (
              <li
                key={step.id}
                className="flex flex-col gap-2 rounded-soft border border-sand-deep bg-paper-raised p-4"
              >
                <div className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-1">
                  <h3 id={headingId} className="font-bold">
                    {/* The separator is a bare text node, so the heading's accessible name keeps its spaces. */}
                    <span className="text-ink-soft">Step {index + 1}</span>
                    {' · '}
                    {step.title}
                  </h3>
                  <p className="font-semibold text-moss-ink">
                    {money(step.payMinor)}
                    {step.status === 'done' ? <span className="font-normal"> earned</span> : null}
                  </p>
                </div>
                {step.description ? <p className="text-fine text-ink-soft">{step.description}</p> : null}
                <p className="flex flex-wrap items-center gap-x-2 gap-y-1 text-fine">
                  <span className={`rounded-full px-3 py-0.5 font-semibold ${statusClasses[step.status]}`}>
                    {stepStatusWords[step.status]}
                  </span>
                  {step.status === 'done' && step.completedAt ? (
                    <span className="text-ink-soft">on {formatDate(step.completedAt)}</span>
                  ) : null}
                  {windowWords ? (
                    <span className={step.status === 'overdue' ? 'text-ink' : 'text-ink-soft'}>{windowWords}</span>
                  ) : null}
                </p>
                {step.status === 'done' && step.id === justCompletedId ? (
                  <StepDoneNotice stepNumber={index + 1} pay={money(step.payMinor)} />
                ) : null}
                {how ? <p className="text-fine">{how}</p> : null}
                {canDoNow(step) && step.hasTask ? (
                  <OpenTaskButton
                    studyId={studyId}
                    stepId={step.id}
                    describedBy={headingId}
                    alsoTakesCode={step.hasCompletionCode}
                    onNeedsReconsent={onNeedsReconsent}
                  />
                ) : null}
                {canDoNow(step) && step.hasCompletionCode ? (
                  <StepCompletionForm
                    studyId={studyId}
                    stepId={step.id}
                    labelledBy={headingId}
                    contactEmail={contactEmail}
                    onCompleted={() => setJustCompletedId(step.id)}
                    onNeedsReconsent={onNeedsReconsent}
                    fallback={step.hasTask}
                  />
                ) : null}
              </li>
            );
          })}
        </ol>
      )}

      <EarnedSummary earned={earned} currency={currency} />
      <p className="text-fine">
        <Link to="/payouts" className="font-semibold text-clay-ink underline decoration-2 underline-offset-4">
          Getting paid
        </Link>
        : set up how you receive your pay, and see every payment.
      </p>
    </section>
  );
}

/** Replaces the code form once it worked; focus moves here because the button that had it is gone. */
function StepDoneNotice({ stepNumber, pay }: { stepNumber: number; pay: string }) {
  const ref = useRef<HTMLDivElement>(null);
  useEffect(() => ref.current?.focus(), []);
  return (
    <div ref={ref} tabIndex={-1} className="focus:outline-none">
      <Notice tone="success" title={`Thank you: step ${stepNumber} is done`}>
        {pay} is added to what you have earned. The research team approves it, then it is sent to you.
      </Notice>
    </div>
  );
}

export function EarnedSummary({ earned, currency }: Pick<MyEnrollment, 'earned' | 'currency'>) {
  const money = (minor: number) => formatMinor(minor, currency);
  return (
    <dl className="grid grid-cols-3 gap-2 rounded-soft bg-sand p-3 text-center">
      <div className="flex flex-col">
        <dt className="text-fine text-ink-soft">Earned so far</dt>
        <dd className="font-bold">{money(earned.earnedMinor)}</dd>
      </div>
      <div className="flex flex-col">
        <dt className="text-fine text-ink-soft">Paid to you</dt>
        <dd className="font-bold">{money(earned.paidMinor)}</dd>
      </div>
      <div className="flex flex-col">
        <dt className="text-fine text-ink-soft">Still to be paid</dt>
        <dd className="font-bold">{money(earned.stillToBePaidMinor)}</dd>
      </div>
    </dl>
  );
}
