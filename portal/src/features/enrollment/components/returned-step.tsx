import { Link } from 'react-router-dom';
import { formatDate } from '@/lib/date-format';
import { formatMinor } from '@/lib/money';
import type { EnrollmentStep, MyEnrollment } from '../api/get-my-enrollment';
import { EarnedSummary } from './your-steps';

type ReturnedStepProps = Pick<MyEnrollment, 'currency' | 'earned'> & {
  step: EnrollmentStep;
  stepNumber: number;
  /** Marked done just now, or on an earlier return (then its pay may already be on its way). */
  justNow: boolean;
};

/** The step a task sent the person back from: that it is done, what it pays, and what they have earned in the study. */
export function ReturnedStep({ step, stepNumber, currency, earned, justNow }: ReturnedStepProps) {
  const pay = formatMinor(step.payMinor, currency);
  return (
    <section
      aria-labelledby="returned-step-heading"
      className="flex flex-col gap-4 rounded-soft border border-sand-deep bg-paper-raised p-4"
    >
      <h2 id="returned-step-heading" className="text-lead font-bold">
        <span className="text-ink-soft">Step {stepNumber}</span>
        {' · '}
        {step.title}
      </h2>
      <dl className="flex flex-col gap-2">
        <div className="flex flex-wrap justify-between gap-x-3">
          <dt className="text-ink-soft">Status</dt>
          <dd className="font-semibold text-moss-ink">
            {step.completedAt ? `Done on ${formatDate(step.completedAt)}` : 'Done'}
          </dd>
        </div>
        <div className="flex flex-wrap justify-between gap-x-3">
          <dt className="text-ink-soft">{justNow ? 'Owed to you' : 'Earned'}</dt>
          <dd className="font-bold text-moss-ink">{pay}</dd>
        </div>
      </dl>
      <p className="text-fine">
        {justNow
          ? 'The research team approves this pay, then it is sent to you.'
          : `It counts once: its ${pay} is in what you have earned below.`}{' '}
        <Link to="/payouts" className="font-semibold text-clay-ink underline decoration-2 underline-offset-4">
          Getting paid
        </Link>{' '}
        shows where each payment stands.
      </p>
      <EarnedSummary earned={earned} currency={currency} />
    </section>
  );
}
