import createClient from 'openapi-fetch';
import type { paths } from './api-schema';
import { mayRefreshAfter } from './session-refresh';

type SessionExpiredListener = () => void;
const sessionExpiredListeners = new Set<SessionExpiredListener>();

/** Called when a request came back 401 and a refresh could not renew the session. */
export function onSessionExpired(listener: SessionExpiredListener): () => void {
  sessionExpiredListeners.add(listener);
  return () => sessionExpiredListeners.delete(listener);
}

// Concurrent 401s share one refresh call: the refresh token rotates, so a second
// parallel refresh would present an already-rotated token and revoke the session.
let refreshInFlight: Promise<boolean> | null = null;

function refreshSession(): Promise<boolean> {
  refreshInFlight ??= globalThis
    .fetch(new Request(new URL('/api/auth/refresh', apiOrigin()), { method: 'POST', credentials: 'include' }))
    .then((response) => response.ok)
    .catch(() => false)
    .finally(() => {
      refreshInFlight = null;
    });
  return refreshInFlight;
}

async function fetchWithRefresh(request: Request): Promise<Response> {
  const retry = request.clone();
  const response = await globalThis.fetch(request);
  if (!mayRefreshAfter(response.status, new URL(request.url).pathname)) return response;

  if (await refreshSession()) {
    const retried = await globalThis.fetch(retry);
    if (retried.status !== 401) return retried;
  }
  sessionExpiredListeners.forEach((listener) => listener());
  return response;
}

function apiOrigin(): string {
  return globalThis.location?.origin ?? 'http://127.0.0.1';
}

/** The one typed client for the api (same origin; Vite proxies /api). Session cookies travel with every call. */
export const api = createClient<paths>({
  baseUrl: apiOrigin(),
  credentials: 'include',
  // Looked up per call so tests can replace globalThis.fetch.
  fetch: (request: Request) => fetchWithRefresh(request),
});
