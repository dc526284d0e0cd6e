import { Link } from 'react-router-dom';
import { buttonRecipe } from '@/components/ui/recipes';
import { cx } from '@/components/ui/cx';

export function Component() {
  return (
    <main className="mx-auto flex min-h-dvh max-w-lg flex-col justify-center gap-3 px-6">
      <title>Page not found · Evenhand</title>
      <p className="text-xs font-semibold tracking-wide text-ink-faint uppercase">Evenhand · 404</p>
      <h1 className="text-2xl font-semibold">Page not found</h1>
      <p className="text-ink-muted">
        There is nothing at this address. It may have moved, or the link may be mistyped.
      </p>
      <div className="mt-2">
        <Link to="/" className={cx(buttonRecipe.base, buttonRecipe.sizes.regular, buttonRecipe.variants.primary)}>
          Go to the start page
        </Link>
      </div>
    </main>
  );
}
