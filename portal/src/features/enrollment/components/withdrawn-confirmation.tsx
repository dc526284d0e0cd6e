import { type ReactNode, useEffect, useRef } from 'react';
import { ButtonLink } from '@/components/ui/button';
import { formatDateTime } from '@/lib/date-format';
import { formatMinor } from '@/lib/money';

type WithdrawnConfirmationProps = {
  studyTitle: string;
  withdrewAt: string | null;
  currency: string;
  earnedMinor: number;
  stillToBePaidMinor: number;
  /** What the person keeps beyond the amounts (their signed form), shown before the way out. */
  children?: ReactNode;
};

export function WithdrawnConfirmation({
  studyTitle,
  withdrewAt,
  currency,
  earnedMinor,
  stillToBePaidMinor,
  children,
}: WithdrawnConfirmationProps) {
  const headingRef = useRef<HTMLHeadingElement>(null);
  // The dialog just closed; start screen-reader and keyboard users at the confirmation.
  useEffect(() => headingRef.current?.focus(), []);
  const money = (minor: number) => formatMinor(minor, currency);

  return (
    <section aria-labelledby="withdrawn-heading" className="flex flex-col gap-5">
      <h2 id="withdrawn-heading" ref={headingRef} tabIndex={-1} className="text-heading font-bold focus:outline-none">
        You have stopped taking part
      </h2>
      <p>
        You are no longer taking part in <strong>{studyTitle}</strong>
        {withdrewAt ? <> since {formatDateTime(withdrewAt)}</> : null}. Thank you for the time you gave.
      </p>
      <dl className="flex flex-col gap-1 rounded-soft bg-sand px-4 py-3">
        <div className="flex justify-between gap-3">
          <dt>You earned</dt>
          <dd className="font-bold">{money(earnedMinor)}</dd>
        </div>
        <div className="flex justify-between gap-3">
          <dt>Still to be paid to you</dt>
          <dd className="font-bold">{money(stillToBePaidMinor)}</dd>
        </div>
      </dl>
      <p>
        We have sent you an e-mail to confirm. What you did so far stays on record, and nothing new will be collected.
        You will not be asked to do anything more for this study.
      </p>
      {children}
      <ButtonLink to="/studies" variant="secondary" wide>
        Go to your studies
      </ButtonLink>
    </section>
  );
}
