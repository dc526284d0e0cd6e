import { Button } from './button';
import { cx } from './cx';
import { noticeRecipe } from './recipes';
import { Spinner } from './spinner';

export function LoadingState({ label = 'Loading…', className }: { label?: string; className?: string }) {
  return (
    <div
      role="status"
      aria-live="polite"
      className={cx('flex items-center justify-center gap-2 py-10 text-sm text-ink-muted', className)}
    >
      <Spinner />
      <span>{label}</span>
    </div>
  );
}

export interface EmptyStateProps {
  title: string;
  children?: React.ReactNode;
  action?: React.ReactNode;
}

export function EmptyState({ title, children, action }: EmptyStateProps) {
  return (
    <div className="flex flex-col items-center gap-2 rounded-lg border border-dashed border-line-strong bg-surface px-6 py-12 text-center">
      <p className="text-lg font-semibold text-ink">{title}</p>
      {children && <div className="max-w-prose text-sm text-ink-muted">{children}</div>}
      {action && <div className="mt-2">{action}</div>}
    </div>
  );
}

export interface ErrorStateProps {
  title?: string;
  message: string;
  onRetry?: () => void;
}

export function ErrorState({ title = 'This could not be loaded', message, onRetry }: ErrorStateProps) {
  return (
    <div
      role="alert"
      className="flex flex-col items-center gap-2 rounded-lg border border-danger/30 bg-danger-soft px-6 py-10 text-center"
    >
      <p className="text-lg font-semibold text-danger">{title}</p>
      <p className="max-w-prose text-sm text-ink">{message}</p>
      {onRetry && (
        <Button className="mt-2" onClick={onRetry}>
          Try again
        </Button>
      )}
    </div>
  );
}

export type NoticeTone = keyof typeof noticeRecipe.tones;

/** A message above a form; announced when it appears. */
export function Notice({
  tone = 'danger',
  children,
  className,
}: {
  tone?: NoticeTone;
  children: React.ReactNode;
  className?: string;
}) {
  return (
    <div
      role={tone === 'info' ? 'status' : 'alert'}
      className={cx(noticeRecipe.base, noticeRecipe.tones[tone], className)}
    >
      {children}
    </div>
  );
}
