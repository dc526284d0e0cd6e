import { useCallback } from 'react';
import { useNavigate, useSearchParams } from 'react-router-dom';
import { PageLayout } from '@/components/layout/page-layout';
import type { LinkSession } from '@/features/auth/api/consume-sign-in-link';
import { SignInLinkStatus } from '@/features/auth/components/sign-in-link-status';

export function SignInLinkRoute() {
  const [searchParams] = useSearchParams();
  const navigate = useNavigate();
  // replace: the used token should not stay in the history, where Back would try it again.
  // A link asked for from a study page leads back to that study, where the person carries on.
  const goOn = useCallback(
    (session: LinkSession) =>
      void navigate(session.studySlug ? `/s/${encodeURIComponent(session.studySlug)}` : '/studies', { replace: true }),
    [navigate],
  );

  return (
    <PageLayout>
      <title>Signing in · Evenhand</title>
      <SignInLinkStatus token={searchParams.get('token')} onSignedIn={goOn} />
    </PageLayout>
  );
}
