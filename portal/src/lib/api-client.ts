import { createEvenhandClient } from '@evenhand/contract';

type SessionExpiredListener = () => void;
const sessionExpiredListeners = new Set<SessionExpiredListener>();

/** Called when a request came back 401 and a refresh could not renew the session. */
export function onSessionExpired(listener: SessionExpiredListener): () => void {
  sessionExpiredListeners.add(listener);
  return () => sessionExpiredListeners.delete(listener);
}

function apiOrigin(): string {
  return globalThis.location?.origin ?? 'http://127.0.0.1';
}

/** The one typed client for the api (same origin; Vite proxies /api). Session cookies travel with every call. */
export const api = createEvenhandClient({
  baseUrl: apiOrigin(),
  onSessionLost: () => sessionExpiredListeners.forEach((listener) => listener()),
});
