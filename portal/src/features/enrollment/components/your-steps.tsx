import { formatDate } from '@/lib/date-format';
import { formatMoney } from '@/lib/money';
import type { EnrollmentStep, MyEnrollment } from '../api/get-my-enrollment';

const statusWords: Record<EnrollmentStep['status'], string> = {
  done: 'Done',
  open: 'Ready for you',
  locked: 'Not open yet',
};

const statusClasses: Record<EnrollmentStep['status'], string> = {
  done: 'bg-moss-tint text-moss-ink',
  open: 'bg-clay-tint text-clay-ink',
  locked: 'bg-sand text-ink-soft',
};

/** The study's steps with where each stands and what it pays, and what has been earned so far. */
export function YourSteps({ steps, currency, earned }: Pick<MyEnrollment, 'steps' | 'currency' | 'earned'>) {
  const money = (minor: number) => formatMoney(minor, currency);
  const ordered = [...steps].sort((a, b) => a.position - b.position);
  const done = ordered.filter((step) => step.status === 'done').length;

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
          {ordered.map((step, index) => (
            <li
              key={step.id}
              className="flex flex-col gap-2 rounded-soft border border-sand-deep bg-paper-raised p-4"
            >
              <div className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-1">
                <h3 className="font-bold">
                  <span className="text-ink-soft">Step {index + 1} · </span>
                  {step.title}
                </h3>
                <p className="font-semibold text-moss-ink">{money(step.payMinor)}</p>
              </div>
              {step.description ? <p className="text-fine text-ink-soft">{step.description}</p> : null}
              <p className="flex flex-wrap items-center gap-2 text-fine">
                <span className={`rounded-full px-3 py-0.5 font-semibold ${statusClasses[step.status]}`}>
                  {statusWords[step.status]}
                </span>
                {step.status === 'done' && step.completedAt ? (
                  <span className="text-ink-soft">on {formatDate(step.completedAt)}</span>
                ) : null}
              </p>
            </li>
          ))}
        </ol>
      )}

      <EarnedSummary earned={earned} currency={currency} />
    </section>
  );
}

export function EarnedSummary({ earned, currency }: Pick<MyEnrollment, 'earned' | 'currency'>) {
  const money = (minor: number) => formatMoney(minor, currency);
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
