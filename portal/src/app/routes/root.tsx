import { isRouteErrorResponse, Outlet, useNavigation, useRouteError } from 'react-router-dom';
import { PageLayout } from '@/components/layout/page-layout';
import { Button, buttonClasses } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { NotFoundContent } from './not-found';

export function RootLayout() {
  const navigation = useNavigation();
  return (
    <>
      {navigation.state !== 'idle' ? (
        <div aria-hidden="true" className="fixed inset-x-0 top-0 z-10 h-1 animate-pulse bg-clay" />
      ) : null}
      <Outlet />
    </>
  );
}

export function RootHydrateFallback() {
  return (
    <PageLayout>
      <Spinner label="Opening Evenhand…" />
    </PageLayout>
  );
}

/** Last line of defence: anything thrown while loading or drawing a page ends up here, in plain words. */
export function RootErrorBoundary() {
  const error = useRouteError();

  if (isRouteErrorResponse(error) && error.status === 404) {
    return (
      <PageLayout>
        <NotFoundContent />
      </PageLayout>
    );
  }

  console.error(error);
  return (
    <PageLayout>
      <title>Something went wrong · Evenhand</title>
      <section role="alert" className="flex flex-col gap-5">
        <h1 className="text-title font-bold">Sorry, something went wrong</h1>
        <p className="text-lead">
          This page stopped working. Nothing you did caused it. Reloading usually helps; if it keeps happening, please
          try again later.
        </p>
        <div className="flex flex-col gap-3">
          <Button wide onClick={() => window.location.reload()}>
            Reload the page
          </Button>
          {/* A plain anchor: after a crash the router itself may be what broke. */}
          <a href="/" className={buttonClasses('secondary', 'w-full')}>
            Go to the start
          </a>
        </div>
      </section>
    </PageLayout>
  );
}
