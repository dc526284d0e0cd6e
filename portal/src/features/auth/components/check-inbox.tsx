import { useEffect, useRef } from 'react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { describeProblem } from '@/lib/problem-message';
import { useRequestSignInLink } from '../api/request-sign-in-link';

type CheckInboxProps = {
  email: string;
  studySlug?: string | undefined;
  onChangeAddress: () => void;
};

export function CheckInbox({ email, studySlug, onChangeAddress }: CheckInboxProps) {
  const resend = useRequestSignInLink();
  const headingRef = useRef<HTMLHeadingElement>(null);

  // The form just disappeared; put screen-reader and keyboard users at the start of what replaced it.
  useEffect(() => headingRef.current?.focus(), []);

  return (
    <section aria-labelledby="check-inbox-heading" className="flex flex-col gap-6">
      <div className="flex flex-col gap-3">
        <EnvelopeIllustration />
        <h1 id="check-inbox-heading" ref={headingRef} tabIndex={-1} className="text-title font-bold focus:outline-none">
          Check your inbox
        </h1>
        <p className="text-lead">
          We sent a sign-in link to <strong className="font-bold wrap-anywhere">{email}</strong>.
        </p>
      </div>

      <ul className="flex flex-col gap-3 rounded-card bg-sand px-5 py-4">
        <ExpectItem>Open the e-mail from Evenhand and tap the link in it.</ExpectItem>
        <ExpectItem>The link works for 15 minutes and only once.</ExpectItem>
        <ExpectItem>Open it on the phone or computer where you want to be signed in.</ExpectItem>
        <ExpectItem>Nothing after a few minutes? Look in your spam or junk folder.</ExpectItem>
      </ul>

      <div aria-live="polite">
        {resend.isSuccess ? (
          <Notice tone="success" title="We sent you a new link.">
            Use the newest e-mail.
          </Notice>
        ) : null}
        {resend.isError ? (
          <Notice tone="error" title="We could not send another link">
            {describeProblem(resend.error)}
          </Notice>
        ) : null}
      </div>

      <div className="flex flex-col gap-3">
        <Button
          variant="secondary"
          wide
          disabled={resend.isPending}
          onClick={() => resend.mutate(studySlug ? { email, studySlug } : { email })}
        >
          {resend.isPending ? 'Sending…' : 'Send the link again'}
        </Button>
        <Button variant="quiet" wide onClick={onChangeAddress}>
          Wrong address? Change it
        </Button>
      </div>
    </section>
  );
}

function ExpectItem({ children }: { children: string }) {
  return (
    <li className="flex gap-3">
      <span aria-hidden="true" className="mt-2.5 size-2 shrink-0 rounded-full bg-clay" />
      <span>{children}</span>
    </li>
  );
}

function EnvelopeIllustration() {
  return (
    <svg aria-hidden="true" viewBox="0 0 64 48" className="h-12 w-16">
      <rect x="2" y="2" width="60" height="44" rx="8" className="fill-clay-tint stroke-clay" strokeWidth="3" />
      <path d="M6 8l26 20L58 8" className="fill-none stroke-clay" strokeWidth="3" strokeLinejoin="round" />
    </svg>
  );
}
