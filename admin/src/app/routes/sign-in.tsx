import { Link, Navigate, useLocation, useNavigate } from 'react-router-dom';
import { LoadingState } from '@/components/ui/states';
import { Wordmark } from '@/components/ui/wordmark';
import { useMe } from '@/features/auth/api/get-me';
import { SignInForm } from '@/features/auth/components/sign-in-form';
import { participantSiteUrl } from '@/lib/site-config';
import { safeReturnPath } from '../safe-return-path';

export function Component() {
  const me = useMe();
  const navigate = useNavigate();
  const location = useLocation();
  const returnPath = safeReturnPath((location.state as { from?: unknown } | null)?.from) ?? '/';

  if (me.isPending) return <LoadingState label="Checking your session…" className="min-h-dvh" />;
  if (me.data) return <Navigate to={returnPath} replace />;

  return (
    <main className="flex min-h-dvh items-start justify-center px-4 pt-[14vh]">
      <title>Sign in · Evenhand</title>
      <div className="w-full max-w-sm">
        <div className="mb-5 flex items-center gap-2">
          <Wordmark className="size-8 text-spruce" />
          <span className="text-2xl font-semibold tracking-tight">Evenhand</span>
          <span className="text-sm text-ink-muted">for lab staff</span>
        </div>
        <div className="rounded-lg border border-line bg-surface p-6 shadow-raised">
          <h1 className="mb-4 text-lg font-semibold">Sign in</h1>
          <SignInForm onSignedIn={() => navigate(returnPath, { replace: true })} />
          <p className="mt-4 text-sm">
            <Link
              to="/forgot-password"
              className="font-medium text-spruce-ink underline underline-offset-2 hover:text-spruce"
            >
              Forgot your password?
            </Link>
          </p>
        </div>
        <p className="mt-4 text-sm text-ink-muted">
          Taking part in a study? Participants sign in on the{' '}
          <a
            href={participantSiteUrl}
            className="font-medium text-spruce-ink underline underline-offset-2 hover:text-spruce"
          >
            participant site
          </a>{' '}
          instead.
        </p>
      </div>
    </main>
  );
}
