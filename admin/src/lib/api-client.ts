import createClient from 'openapi-fetch';
import type { paths } from './api-schema';
import { ApiError, toApiProblem } from './api-error';
import { createSessionFetch } from './session-fetch';

// Absolute base so Request objects are valid outside a browser page too (tests run under jsdom + Node's fetch).
const origin = globalThis.location?.origin ?? 'http://localhost';

const sessionLostListeners = new Set<() => void>();

/** Registers what to do when a call fails with 401 and refreshing the session did not help. */
export function onSessionLost(listener: () => void): () => void {
  sessionLostListeners.add(listener);
  return () => sessionLostListeners.delete(listener);
}

const sessionFetch = createSessionFetch({
  // Looked up on each call so tests can replace the global fetch.
  fetch: (request) => globalThis.fetch(request),
  refresh: async () => {
    const response = await globalThis.fetch(
      new Request(`${origin}/api/auth/refresh`, { method: 'POST', credentials: 'include' }),
    );
    return response.ok;
  },
  onSessionLost: () => sessionLostListeners.forEach((listener) => listener()),
});

export const apiClient = createClient<paths>({
  baseUrl: origin,
  credentials: 'include',
  fetch: sessionFetch,
});

interface FetchResult<Data> {
  data?: Data;
  error?: unknown;
  response: Response;
}

/** Turns an openapi-fetch result into its data, or throws an ApiError in the api's error shape. */
export async function unwrap<Data>(call: Promise<FetchResult<Data>>): Promise<Data> {
  let result: FetchResult<Data>;
  try {
    result = await call;
  } catch {
    throw new ApiError({ statusCode: 0, code: 'NETWORK', message: 'Could not reach the Evenhand server. Check your connection and try again.' });
  }
  if (!result.response.ok) throw new ApiError(toApiProblem(result.response.status, result.error));
  return result.data as Data;
}
