// Authentication as the provider publishes it (https://docs.stripe.com/api/authentication):
// the secret key arrives as a Bearer token or as the user name of HTTP Basic auth; a missing or
// unusable key is a 401. This stand-in only ever holds test data, so it takes any `sk_test_` key.
// Pure: no framework imports.

import { providerErrors } from '../errors/provider-error';

export const TEST_SECRET_KEY_PREFIX = 'sk_test_';

/** The key from an Authorization header, or undefined when there is none. */
export function readApiKey(authorization: string | undefined): string | undefined {
  if (!authorization) return undefined;
  const bearer = /^Bearer\s+(.+)$/i.exec(authorization.trim());
  if (bearer) return bearer[1]?.trim() || undefined;
  const basic = /^Basic\s+(.+)$/i.exec(authorization.trim());
  if (basic) {
    const decoded = Buffer.from(basic[1] ?? '', 'base64').toString('utf8');
    const user = decoded.split(':')[0];
    return user || undefined;
  }
  return undefined;
}

/** Shows the start and the last four characters, never the whole key. */
export function maskApiKey(key: string): string {
  if (key.length <= 12) return `${key.slice(0, 3)}${'*'.repeat(Math.max(0, key.length - 3))}`;
  return `${key.slice(0, 8)}${'*'.repeat(key.length - 12)}${key.slice(-4)}`;
}

/** Returns the key when it is a usable test secret key; throws the provider's 401 otherwise. */
export function requireTestSecretKey(authorization: string | undefined): string {
  const key = readApiKey(authorization);
  if (key === undefined) throw providerErrors.missingApiKey();
  if (!key.startsWith(TEST_SECRET_KEY_PREFIX) || key.length === TEST_SECRET_KEY_PREFIX.length || /\s/.test(key)) {
    throw providerErrors.invalidApiKey(maskApiKey(key));
  }
  return key;
}
