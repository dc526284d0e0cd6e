import { useRef } from 'react';
import { Navigate, NavLink, Outlet } from 'react-router-dom';
import { PageLayout } from '@/components/layout/page-layout';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Spinner } from '@/components/ui/spinner';
import { useMe } from '@/features/auth/api/get-me';
import { useSignOut } from '@/features/auth/api/sign-out';
import { describeProblem } from '@/lib/problem-message';
import type { SignInLocationState } from './sign-in';
import { LoadFailed } from '@/components/ui/load-failed';

/** Route guard and frame for everything that needs a session. */
export function SignedInLayout() {
  const me = useMe();
  const signOut = useSignOut();
  const wasSignedIn = useRef(false);
  if (me.data) wasSignedIn.current = true;

  if (me.data === null) {
    const state: SignInLocationState = !signOut.isIdle
      ? { signedOut: true }
      : wasSignedIn.current
        ? { sessionEnded: true }
        : null;
    return <Navigate to="/sign-in" replace state={state} />;
  }

  if (me.isError) {
    return (
      <PageLayout>
        <LoadFailed title="We could not check whether you are signed in" read={me} />
      </PageLayout>
    );
  }

  if (me.isPending) {
    return (
      <PageLayout>
        <Spinner label="Checking that you are signed in…" />
      </PageLayout>
    );
  }

  const actions = (
    <Button variant="secondary" onClick={() => signOut.mutate()} disabled={signOut.isPending} className="px-4">
      {signOut.isPending ? 'Signing out…' : 'Sign out'}
    </Button>
  );

  return (
    <PageLayout actions={actions} navigation={<SignedInNavigation />}>
      {signOut.isError ? (
        <div className="mb-6">
          <Notice tone="error" title="We could not sign you out">
            {describeProblem(signOut.error)}
          </Notice>
        </div>
      ) : null}
      <Outlet context={me.data} />
    </PageLayout>
  );
}

const navigationLinks = [
  { to: '/studies', label: 'Your studies' },
  { to: '/payouts', label: 'Getting paid' },
];

const navLinkClasses = ({ isActive }: { isActive: boolean }) =>
  `flex min-h-12 items-center border-b-4 px-3 font-semibold ${
    isActive ? 'border-clay text-ink' : 'border-transparent text-clay-ink underline decoration-2 underline-offset-4'
  }`;

/** The signed-in person's two places; NavLink marks the current one with aria-current="page". */
function SignedInNavigation() {
  return (
    <nav aria-label="Your account">
      <ul className="-mb-px flex gap-2">
        {navigationLinks.map((link) => (
          <li key={link.to}>
            <NavLink to={link.to} className={navLinkClasses}>
              {link.label}
            </NavLink>
          </li>
        ))}
      </ul>
    </nav>
  );
}
