import { useCallback } from 'react';
import { useNavigate, useSearchParams } from 'react-router-dom';
import { PageLayout } from '@/components/layout/page-layout';
import { SignInLinkStatus } from '@/features/auth/components/sign-in-link-status';

export function SignInLinkRoute() {
  const [searchParams] = useSearchParams();
  const navigate = useNavigate();
  // replace: the used token should not stay in the history, where Back would try it again.
  const goToStudies = useCallback(() => void navigate('/studies', { replace: true }), [navigate]);

  return (
    <PageLayout>
      <title>Signing in · Evenhand</title>
      <SignInLinkStatus token={searchParams.get('token')} onSignedIn={goToStudies} />
    </PageLayout>
  );
}
