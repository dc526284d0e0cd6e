import { cx } from './cx';

/** Evenhand's mark: a level beam on a fulcrum with an equal weight at each end. */
export function Wordmark({ className }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={cx('shrink-0', className)} aria-hidden="true">
      <path d="M5 13h22" stroke="currentColor" strokeWidth="2.4" strokeLinecap="round" />
      <circle cx="8" cy="9.5" r="3" className="fill-ochre" />
      <circle cx="24" cy="9.5" r="3" className="fill-ochre" />
      <path d="M16 14.5 11 25h10z" fill="currentColor" />
    </svg>
  );
}
