import { useEffect, useRef } from 'react';
import { Button, ButtonLink } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-problem';
import { describeProblem } from '@/lib/problem-message';
import { useConsumeSignInLink } from '../api/consume-sign-in-link';
import type { LinkSession } from '../api/consume-sign-in-link';

type SignInLinkStatusProps = {
  token: string | null;
  onSignedIn: (session: LinkSession) => void;
};

/** Uses the one-time token from the e-mailed link, once, and says plainly what happened. */
export function SignInLinkStatus({ token, onSignedIn }: SignInLinkStatusProps) {
  const consume = useConsumeSignInLink();
  const usedToken = useRef<string | null>(null);

  useEffect(() => {
    // A link works once; React's development double effects must not spend it twice.
    if (!token || usedToken.current === token) return;
    usedToken.current = token;
    consume.mutate(token, { onSuccess: onSignedIn });
  }, [token, consume, onSignedIn]);

  if (!token) {
    return (
      <LinkProblem title="This link is incomplete">
        The sign-in code is missing from the address. This can happen when a link is copied only in part. Ask for a new
        link and tap it straight from the e-mail.
      </LinkProblem>
    );
  }

  if (consume.isError) {
    // The api refuses an address that is not a whole sign-in link before looking it up; say so in our words.
    if (isApiError(consume.error, 'VALIDATION_FAILED')) {
      return (
        <LinkProblem title="This sign-in link is not complete">
          Part of the link is missing or was changed, which can happen when a link is copied by hand or split across two
          lines. Ask for a new link and tap it straight from the e-mail.
        </LinkProblem>
      );
    }
    if (isApiError(consume.error, 'LINK_INVALID')) {
      return (
        <LinkProblem title="This sign-in link can no longer be used">
          Each link works once, for 15 minutes. This one has expired or has been used already. Ask for a new one — it
          only takes a moment.
        </LinkProblem>
      );
    }
    return (
      <LinkProblem
        title="We could not sign you in just now"
        onRetry={() => consume.mutate(token, { onSuccess: onSignedIn })}
      >
        {describeProblem(consume.error)}
      </LinkProblem>
    );
  }

  return <Spinner label="Signing you in…" />;
}

function LinkProblem({ title, children, onRetry }: { title: string; children: string; onRetry?: () => void }) {
  return (
    <section role="alert" aria-labelledby="link-problem-heading" className="flex flex-col gap-5">
      <h1 id="link-problem-heading" className="text-title font-bold">
        {title}
      </h1>
      <p className="text-lead">{children}</p>
      <div className="flex flex-col gap-3">
        {onRetry ? (
          <Button wide onClick={onRetry}>
            Try again
          </Button>
        ) : null}
        <ButtonLink to="/sign-in" wide variant={onRetry ? 'secondary' : 'primary'}>
          Send me a new sign-in link
        </ButtonLink>
      </div>
    </section>
  );
}
