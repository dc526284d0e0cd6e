import { NavLink } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { cx } from '@/components/ui/cx';
import { Wordmark } from '@/components/ui/wordmark';

export interface StaffNavItem {
  to: string;
  label: string;
}

export interface StaffLayoutProps {
  navItems: readonly StaffNavItem[];
  personName: string;
  personEmail: string;
  roleLabel: string;
  onSignOut: () => void;
  signingOut: boolean;
  children: React.ReactNode;
}

export function StaffLayout({
  navItems,
  personName,
  personEmail,
  roleLabel,
  onSignOut,
  signingOut,
  children,
}: StaffLayoutProps) {
  return (
    <div className="flex min-h-dvh flex-col">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:fixed focus:top-2 focus:left-2 focus:z-50 focus:rounded-md focus:bg-surface focus:px-3 focus:py-2 focus:text-sm focus:shadow-overlay"
      >
        Skip to content
      </a>
      <header className="bg-night text-night-ink">
        <div className="mx-auto flex min-h-12 max-w-6xl flex-wrap items-stretch gap-x-6 px-5">
          <div className="flex items-center gap-2 py-2">
            <Wordmark className="size-6" />
            <span className="text-lg font-semibold tracking-tight">Evenhand</span>
            <span className="rounded-sm border border-night-line px-1.5 text-2xs font-semibold tracking-wide text-night-muted uppercase">
              Staff
            </span>
          </div>
          <nav aria-label="Main" className="flex items-stretch gap-1">
            {navItems.map((item) => (
              <NavLink
                key={item.to}
                to={item.to}
                className={({ isActive }) =>
                  cx(
                    'flex items-center border-b-2 px-3 text-sm font-medium transition-colors',
                    isActive
                      ? 'border-ochre text-night-ink'
                      : 'border-transparent text-night-muted hover:text-night-ink',
                  )
                }
              >
                {item.label}
              </NavLink>
            ))}
          </nav>
          <div className="ml-auto flex items-center gap-3 py-2">
            <div className="text-right leading-tight">
              <p className="sr-only">Signed in as</p>
              <p className="text-sm font-medium max-sm:sr-only" title={personEmail}>
                {personName}
              </p>
              <p className="text-xs text-night-muted">{roleLabel}</p>
              <NavLink
                to="/account"
                className="text-xs text-night-muted underline-offset-2 hover:text-night-ink hover:underline"
              >
                Your account
              </NavLink>
            </div>
            <Button variant="onNight" onClick={onSignOut} pending={signingOut}>
              Sign out
            </Button>
          </div>
        </div>
      </header>
      <main id="main" tabIndex={-1} className="mx-auto w-full max-w-6xl flex-1 px-5 py-6 focus:outline-none">
        {children}
      </main>
    </div>
  );
}
