import { createEvenhandClient } from '@evenhand/contract';

// The typed client and its error handling are the contract's (api/contract/src/client.ts).
export { unwrap } from '@evenhand/contract';

// Absolute base so Request objects are valid outside a browser page too (tests run under jsdom + Node's fetch).
const origin = globalThis.location?.origin ?? 'http://localhost';

const sessionLostListeners = new Set<() => void>();

/** Registers what to do when a call fails with 401 and refreshing the session did not help. */
export function onSessionLost(listener: () => void): () => void {
  sessionLostListeners.add(listener);
  return () => sessionLostListeners.delete(listener);
}

export const apiClient = createEvenhandClient({
  baseUrl: origin,
  onSessionLost: () => sessionLostListeners.forEach((listener) => listener()),
});
