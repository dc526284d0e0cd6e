import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';

function BrandMark() {
  return (
    <Link to="/" className="inline-flex min-h-12 items-center gap-3 rounded-soft pr-2 text-lead font-bold text-ink">
      <svg aria-hidden="true" viewBox="0 0 32 32" className="size-9">
        <rect width="32" height="32" rx="9" className="fill-clay" />
        <path d="M8 11h16M8 17h16M8 23h10" className="stroke-paper" strokeWidth="3" strokeLinecap="round" />
      </svg>
      <span>Evenhand</span>
    </Link>
  );
}

/**
 * Every screen: a skip link, the brand bar (with optional account actions and, below it, navigation) and one main
 * column sized for phones.
 */
export function PageLayout({
  children,
  actions,
  navigation,
}: {
  children: ReactNode;
  actions?: ReactNode;
  navigation?: ReactNode;
}) {
  return (
    <div className="flex min-h-dvh flex-col">
      <a
        href="#main"
        className="sr-only rounded-soft bg-ink px-4 py-3 text-white focus:not-sr-only focus:absolute focus:top-2 focus:left-2"
      >
        Skip to content
      </a>
      <header className="border-b border-sand-deep bg-paper-raised/80">
        <div className="mx-auto flex w-full max-w-xl items-center justify-between gap-3 px-4 py-2">
          <BrandMark />
          {actions}
        </div>
        {navigation ? <div className="mx-auto w-full max-w-xl px-4">{navigation}</div> : null}
      </header>
      <main
        id="main"
        tabIndex={-1}
        className="mx-auto flex w-full max-w-xl flex-1 flex-col px-4 pt-8 pb-16 focus:outline-none"
      >
        {children}
      </main>
      <footer className="mx-auto w-full max-w-xl px-4 pb-8 text-fine text-ink-soft">
        Taking part is always your choice. You can stop at any time.
      </footer>
    </div>
  );
}
