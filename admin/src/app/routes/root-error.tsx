import { isRouteErrorResponse, useRouteError } from 'react-router-dom';
import { buttonRecipe } from '@/components/ui/recipes';
import { cx } from '@/components/ui/cx';

export function RootErrorBoundary() {
  const error = useRouteError();
  const notFound = isRouteErrorResponse(error) && error.status === 404;
  // A failed lazy import usually means a new version was deployed while the tab was open.
  const staleBundle =
    error instanceof TypeError && /dynamically imported module|Importing a module script/i.test(error.message);

  return (
    <main className="mx-auto flex min-h-dvh max-w-lg flex-col justify-center gap-3 px-6">
      <title>Something went wrong · Evenhand</title>
      <p className="text-xs font-semibold tracking-wide text-ink-faint uppercase">Evenhand</p>
      <h1 className="text-2xl font-semibold">{notFound ? 'Page not found' : 'Something went wrong'}</h1>
      <p className="text-ink-muted" role="alert">
        {notFound
          ? 'There is nothing at this address.'
          : staleBundle
            ? 'Evenhand was updated while this page was open. Reload to get the new version.'
            : 'The page hit an unexpected problem. Your saved work is safe; reload to try again.'}
      </p>
      <div className="mt-2 flex gap-2">
        <button
          type="button"
          className={cx(buttonRecipe.base, buttonRecipe.sizes.regular, buttonRecipe.variants.primary)}
          onClick={() => window.location.reload()}
        >
          Reload
        </button>
        <a href="/" className={cx(buttonRecipe.base, buttonRecipe.sizes.regular, buttonRecipe.variants.secondary)}>
          Go to the start page
        </a>
      </div>
    </main>
  );
}
