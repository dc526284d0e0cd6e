import { useMemo } from 'react';
import { Navigate, Outlet, useLocation, useNavigate } from 'react-router-dom';
import { StaffLayout } from '@/components/layouts/staff-layout';
import { Button } from '@/components/ui/button';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { useMe, type Me } from '@/features/auth/api/get-me';
import { useSignOut } from '@/features/auth/api/sign-out';
import { ApiError } from '@/lib/api-error';
import { areaLabels, areaPaths, areasFor, isStaffRole, roleLabels } from '@/lib/role-access';
import { participantSiteUrl } from '@/lib/site-config';
import type { StaffSession } from '../../session-context';

export function Component() {
  const me = useMe();
  const location = useLocation();
  const navigate = useNavigate();
  const signOut = useSignOut();

  const leave = () => signOut.mutate(undefined, { onSettled: () => navigate('/sign-in', { replace: true }) });
  // <Navigate> navigates again whenever its `state` is a new object; a fresh literal each render looped (React's
  // "Maximum update depth exceeded") for as long as the sign-in page's code took to load.
  const returnState = useMemo(
    () => ({ from: `${location.pathname}${location.search}` }),
    [location.pathname, location.search],
  );

  if (me.isPending) return <LoadingState label="Checking your session…" className="min-h-dvh" />;
  if (me.isError) {
    return (
      <main className="mx-auto max-w-lg px-6 py-24">
        <ErrorState
          title="Evenhand cannot be reached"
          message={
            me.error instanceof ApiError ? me.error.message : 'The server did not answer. Try again in a moment.'
          }
          onRetry={() => void me.refetch()}
        />
      </main>
    );
  }
  if (me.data === null) {
    return <Navigate to="/sign-in" replace state={returnState} />;
  }

  const role = me.data.role;
  if (!isStaffRole(role)) return <StaffOnlyNotice me={me.data} onSignOut={leave} signingOut={signOut.isPending} />;

  // The lab requires two-factor sign-in of admins and this one has not set it up: only their account page opens.
  if (me.data.twoFactorSetupNeeded && location.pathname !== '/account') return <Navigate to="/account" replace />;

  const navItems = areasFor(role).map((area) => ({ to: areaPaths[area], label: areaLabels[area] }));
  const session: StaffSession = { me: me.data };
  return (
    <StaffLayout
      navItems={navItems}
      personName={me.data.name}
      personEmail={me.data.email}
      roleLabel={roleLabels[role]}
      onSignOut={leave}
      signingOut={signOut.isPending}
    >
      <Outlet context={session} />
    </StaffLayout>
  );
}

function StaffOnlyNotice({ me, onSignOut, signingOut }: { me: Me; onSignOut: () => void; signingOut: boolean }) {
  return (
    <main className="mx-auto flex min-h-dvh max-w-md flex-col justify-center gap-3 px-6">
      <title>For lab staff · Evenhand</title>
      <p className="text-xs font-semibold tracking-wide text-ink-faint uppercase">Evenhand · Staff</p>
      <h1 className="text-2xl font-semibold">This site is for lab staff</h1>
      <p className="text-ink-muted">
        You are signed in as <strong className="font-semibold text-ink">{me.email}</strong>, a study participant. Your
        studies, consent forms and payments are on the participant site.
      </p>
      <div className="mt-2 flex flex-wrap gap-2">
        <a
          href={participantSiteUrl}
          className="inline-flex h-8 items-center rounded-md bg-spruce px-3 text-sm font-medium text-ink-inverse hover:bg-spruce-strong"
        >
          Go to the participant site
        </a>
        <Button onClick={onSignOut} pending={signingOut}>
          Sign out
        </Button>
      </div>
    </main>
  );
}
