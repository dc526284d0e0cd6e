import { useCallback, useEffect, useRef } from 'react';
import { useSearchParams } from 'react-router-dom';

/**
 * The URL's search params, with an updater that always starts from the newest ones, including a change not yet
 * rendered. The router renders search changes in a transition, so two quick clicks (tick one filter, then another)
 * would otherwise both start from the same render and the second would undo the first.
 */
export function useLatestSearchParams() {
  const [searchParams, setSearchParams] = useSearchParams();
  const pending = useRef<URLSearchParams | null>(null);

  useEffect(() => {
    // The render has caught up with what was last written: read from it again.
    if (pending.current && pending.current.toString() === searchParams.toString()) pending.current = null;
  }, [searchParams]);

  const updateSearchParams = useCallback(
    (change: (current: URLSearchParams) => URLSearchParams, options?: { replace?: boolean }) => {
      const next = change(new URLSearchParams(pending.current ?? searchParams));
      pending.current = next;
      setSearchParams(next, options);
    },
    [searchParams, setSearchParams],
  );

  return [searchParams, updateSearchParams] as const;
}
