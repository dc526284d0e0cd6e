import { describeProblem } from '@/lib/problem-message';
import { Button } from './button';
import { Notice } from './notice';

/** What a failed read offers: its error, and a way to ask again. A TanStack Query result fits as it is. */
export interface RetryableRead {
  error: unknown;
  isFetching: boolean;
  refetch: () => unknown;
}

/** A read that failed: what went wrong in plain words (plus `afterProblem`, if given) and a "Try again" button. */
export function LoadFailed({
  title,
  read,
  afterProblem,
}: {
  title: string;
  read: RetryableRead;
  afterProblem?: string;
}) {
  return (
    <div className="flex flex-col gap-4">
      <Notice tone="error" title={title}>
        {describeProblem(read.error)}
        {afterProblem ? ` ${afterProblem}` : null}
      </Notice>
      <Button variant="secondary" onClick={() => void read.refetch()} disabled={read.isFetching}>
        {read.isFetching ? 'Trying again…' : 'Try again'}
      </Button>
    </div>
  );
}
