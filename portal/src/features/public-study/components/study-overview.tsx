import type { ReactNode } from 'react';
import { formatMinor } from '@/lib/money';
import { minutesInWords, paragraphsOf } from '@/lib/text';
import type { PublicStudy } from '../api/get-public-study';

type StudyOverviewProps = {
  study: PublicStudy;
  /** What the reader can do next (take part, or a notice); shown after they have seen what it involves. */
  action: ReactNode;
};

/** The public study page: what it involves, how long, what each step pays, who can take part, who runs it. */
export function StudyOverview({ study, action }: StudyOverviewProps) {
  const money = (minor: number) => formatMinor(minor, study.currency);
  const steps = [...study.steps].sort((a, b) => a.position - b.position);

  return (
    <article aria-labelledby="study-title" className="flex flex-col gap-8">
      <header className="flex flex-col gap-3">
        <p className="text-fine font-semibold tracking-wide text-clay-ink uppercase">{study.labName}</p>
        <h1 id="study-title" className="text-title font-bold">
          {study.title}
        </h1>
        <dl className="grid grid-cols-2 gap-3">
          {study.estimatedMinutes !== null ? (
            <Fact term="Time">About {minutesInWords(study.estimatedMinutes)} in all</Fact>
          ) : null}
          <Fact term="Pay">{money(study.totalPayMinor)} in all</Fact>
        </dl>
      </header>

      <section aria-labelledby="about-heading" className="flex flex-col gap-3">
        <h2 id="about-heading" className="text-heading font-bold">
          What this study is about
        </h2>
        {paragraphsOf(study.summary).map((paragraph, index) => (
          <p key={index}>{paragraph}</p>
        ))}
      </section>

      <section aria-labelledby="steps-heading" className="flex flex-col gap-3">
        <h2 id="steps-heading" className="text-heading font-bold">
          What taking part involves
        </h2>
        {steps.length === 0 ? (
          <p className="text-ink-soft">The research team has not listed the steps yet.</p>
        ) : (
          <>
            <p>
              {steps.length === 1 ? 'There is one step.' : `There are ${steps.length} steps.`} You are paid for each
              step you complete, even if you stop before the end.
            </p>
            <ol className="flex flex-col gap-3">
              {steps.map((step, index) => (
                <li key={step.position} className="flex gap-4 rounded-soft border border-sand-deep bg-paper-raised p-4">
                  <span
                    aria-hidden="true"
                    className="flex size-9 shrink-0 items-center justify-center rounded-full bg-clay-tint font-bold text-clay-ink"
                  >
                    {index + 1}
                  </span>
                  <div className="flex min-w-0 flex-1 flex-col gap-1">
                    <div className="flex flex-wrap items-baseline justify-between gap-x-3">
                      <h3 className="font-bold">{step.title}</h3>
                      <p className="font-semibold text-moss-ink">{money(step.payMinor)}</p>
                    </div>
                    {step.description ? <p className="text-fine text-ink-soft">{step.description}</p> : null}
                  </div>
                </li>
              ))}
            </ol>
            <p className="flex justify-between rounded-soft bg-sand px-4 py-3 font-bold">
              <span>Total if you complete every step</span>
              <span>{money(study.totalPayMinor)}</span>
            </p>
          </>
        )}
      </section>

      <section aria-labelledby="eligibility-heading" className="flex flex-col gap-3">
        <h2 id="eligibility-heading" className="text-heading font-bold">
          Who can take part
        </h2>
        {study.eligibility.length === 0 ? (
          <p>There are no special requirements for this study.</p>
        ) : (
          <>
            <p>This study is for people who meet all of these:</p>
            <ul className="flex flex-col gap-2">
              {study.eligibility.map((criterion) => (
                <li key={criterion.key} className="flex gap-3">
                  <span aria-hidden="true" className="mt-2.5 size-2 shrink-0 rounded-full bg-clay" />
                  <span>{criterion.label}</span>
                </li>
              ))}
            </ul>
            <p className="text-fine text-ink-soft">You will answer a few short questions about this first.</p>
          </>
        )}
      </section>

      <section aria-labelledby="who-heading" className="flex flex-col gap-2">
        <h2 id="who-heading" className="text-heading font-bold">
          Who runs it
        </h2>
        <p>
          {study.labName}
          {study.protocolNumber ? (
            <>
              {' '}
              · protocol number <span className="font-semibold whitespace-nowrap">{study.protocolNumber}</span>
            </>
          ) : null}
        </p>
        {study.contactEmail ? (
          <p>
            Questions before you start? Write to{' '}
            <a href={`mailto:${study.contactEmail}`} className="font-semibold wrap-anywhere text-clay-ink underline">
              {study.contactEmail}
            </a>
            .
          </p>
        ) : null}
      </section>

      <div className="flex flex-col gap-3">{action}</div>
    </article>
  );
}

function Fact({ term, children }: { term: string; children: ReactNode }) {
  return (
    <div className="flex flex-col rounded-soft bg-sand px-4 py-3">
      <dt className="text-fine text-ink-soft">{term}</dt>
      <dd className="font-bold">{children}</dd>
    </div>
  );
}
