import createClient, { type Client } from 'openapi-fetch';
import type { paths } from './generated/api-schema';
import { ApiError, toApiProblem } from './problem';
import { createSessionFetch } from './session-fetch';

export type EvenhandClient = Client<paths>;

export interface EvenhandClientOptions {
  /** Where the api answers, e.g. the page's own origin (the apps' servers proxy /api). */
  baseUrl: string;
  /** Told when a call was refused with 401 and renewing the session did not help. */
  onSessionLost: () => void;
}

/**
 * The one typed client of the api: every path, body and answer typed from the OpenAPI document. Session cookies
 * travel with every call; a 401 renews the session once (POST /api/auth/refresh) and retries.
 */
export function createEvenhandClient(options: EvenhandClientOptions): EvenhandClient {
  // globalThis.fetch is looked up on each call so tests can replace it.
  const sessionFetch = createSessionFetch({
    fetch: (request) => globalThis.fetch(request),
    refresh: async () =>
      (
        await globalThis.fetch(
          new Request(new URL('/api/auth/refresh', options.baseUrl), { method: 'POST', credentials: 'include' }),
        )
      ).ok,
    onSessionLost: options.onSessionLost,
  });
  return createClient<paths>({ baseUrl: options.baseUrl, credentials: 'include', fetch: sessionFetch });
}

interface FetchResult<Data> {
  data?: Data;
  error?: unknown;
  response: Response;
}

export const NETWORK_PROBLEM_MESSAGE = 'Could not reach the Evenhand server. Check your connection and try again.';

/** Turns a client call into its data, or throws an ApiError in the api's problem shape. */
export async function unwrap<Data>(call: Promise<FetchResult<Data>>): Promise<Data> {
  let result: FetchResult<Data>;
  try {
    result = await call;
  } catch {
    throw new ApiError({ statusCode: 0, code: 'NETWORK', message: NETWORK_PROBLEM_MESSAGE });
  }
  if (!result.response.ok) throw new ApiError(toApiProblem(result.response.status, result.error));
  return result.data as Data;
}
