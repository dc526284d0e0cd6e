/** Paths that must never trigger a refresh-and-retry: a 401 there is the real answer (or the refresh itself failing). */
const sessionPaths = new Set([
  '/api/auth/sign-in',
  '/api/auth/refresh',
  '/api/auth/sign-out',
  '/api/auth/sign-in-link',
  '/api/auth/sign-in-link/consume',
]);

export interface SessionFetchOptions {
  fetch: (request: Request) => Promise<Response>;
  /** Calls POST /api/auth/refresh; resolves true when a new session was issued. */
  refresh: () => Promise<boolean>;
  /** Told once per failed refresh, so the app can return to sign-in. */
  onSessionLost: () => void;
}

/**
 * Wraps fetch so a 401 triggers one refresh and one retry. Concurrent 401s share a single refresh
 * call: the api rotates refresh tokens and treats reuse of a rotated one as theft.
 */
export function createSessionFetch(options: SessionFetchOptions): (request: Request) => Promise<Response> {
  let refreshing: Promise<boolean> | null = null;

  const refreshOnce = () => {
    refreshing ??= options
      .refresh()
      .catch(() => false)
      .finally(() => {
        refreshing = null;
      });
    return refreshing;
  };

  return async (request) => {
    const path = new URL(request.url).pathname.replace(/\/+$/, '');
    if (sessionPaths.has(path)) return options.fetch(request);

    const retry = request.clone();
    const response = await options.fetch(request);
    if (response.status !== 401) return response;

    const renewed = await refreshOnce();
    if (!renewed) {
      options.onSessionLost();
      return response;
    }
    const retried = await options.fetch(retry);
    // Renewed but still refused: the session belongs to no one who may see this any more.
    if (retried.status === 401) options.onSessionLost();
    return retried;
  };
}
