import { ButtonLink } from '@/components/ui/button';

type NotEligibleProps = {
  studyTitle: string;
  /** Plain-language criteria that were not met, as the api words them. */
  reasons: string[];
  contactEmail: string | null;
};

/** Said kindly: not a fit for this study is no judgement of the person. */
export function NotEligible({ studyTitle, reasons, contactEmail }: NotEligibleProps) {
  return (
    <section aria-labelledby="not-eligible-heading" className="flex flex-col gap-5">
      <h2 id="not-eligible-heading" className="text-heading font-bold">
        Thank you — this study is not the right fit this time
      </h2>
      <p>
        Thank you for answering the questions for <strong>{studyTitle}</strong>. Every study needs a particular group of
        people, and from your answers this one is not a match for you.
      </p>
      {reasons.length > 0 ? (
        <div className="flex flex-col gap-2 rounded-soft bg-sand px-4 py-3">
          <p className="font-semibold">This study is looking for people who meet these points:</p>
          <ul className="flex flex-col gap-1">
            {reasons.map((reason) => (
              <li key={reason} className="flex gap-3">
                <span aria-hidden="true" className="mt-2.5 size-2 shrink-0 rounded-full bg-clay" />
                <span>{reason}</span>
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      <p>
        This says nothing about you, and nothing else happens: you have not agreed to anything, and no one will contact
        you about this study.
      </p>
      {contactEmail ? (
        <p className="text-fine text-ink-soft">
          Think an answer was wrong? Write to the research team at{' '}
          <a href={`mailto:${contactEmail}`} className="font-semibold wrap-anywhere text-clay-ink underline">
            {contactEmail}
          </a>
          .
        </p>
      ) : null}
      <ButtonLink to="/studies" variant="secondary" wide>
        Go to your studies
      </ButtonLink>
    </section>
  );
}
