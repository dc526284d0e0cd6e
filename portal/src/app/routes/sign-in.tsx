import { useState } from 'react';
import { Navigate, useLocation, useSearchParams } from 'react-router-dom';
import { PageLayout } from '@/components/layout/page-layout';
import { Notice } from '@/components/ui/notice';
import { useMe } from '@/features/auth/api/get-me';
import { CheckInbox } from '@/features/auth/components/check-inbox';
import { EmailSignInForm } from '@/features/auth/components/email-sign-in-form';

export type SignInLocationState = { signedOut?: boolean; sessionEnded?: boolean } | null;

export function SignInRoute() {
  const [searchParams] = useSearchParams();
  const studySlug = searchParams.get('study')?.trim() || undefined;
  const state = useLocation().state as SignInLocationState;
  const me = useMe();
  const [sentTo, setSentTo] = useState<string | null>(null);
  const [draftEmail, setDraftEmail] = useState('');

  if (me.data) return <Navigate to={studySlug ? `/s/${encodeURIComponent(studySlug)}` : '/studies'} replace />;

  return (
    <PageLayout>
      <title>{sentTo ? 'Check your inbox · Evenhand' : 'Sign in · Evenhand'}</title>
      {sentTo ? (
        <CheckInbox
          email={sentTo}
          studySlug={studySlug}
          onChangeAddress={() => {
            setDraftEmail(sentTo);
            setSentTo(null);
          }}
        />
      ) : (
        <section aria-labelledby="sign-in-heading" className="flex flex-col gap-6">
          {state?.signedOut ? (
            <Notice tone="success" title="You have signed out.">
              See you next time.
            </Notice>
          ) : null}
          {state?.sessionEnded ? (
            <Notice title="Please sign in again.">For your safety, sessions end after a while.</Notice>
          ) : null}
          <div className="flex flex-col gap-3">
            <h1 id="sign-in-heading" className="text-title font-bold">
              {/* Kept whole: a heading broken at the hyphen ("e- / mail") reads badly on a phone. */}
              Sign in with your <span className="whitespace-nowrap">e-mail</span>
            </h1>
            <p className="text-lead">No password needed. We will e-mail you a link; tap it and you are in.</p>
            {studySlug ? (
              <p className="text-body text-ink-soft">You came here from a study link. Sign in to continue.</p>
            ) : null}
          </div>
          <EmailSignInForm studySlug={studySlug} defaultEmail={draftEmail} onSent={setSentTo} />
        </section>
      )}
    </PageLayout>
  );
}
