// Authentication as the provider publishes it (https://docs.stripe.com/api/authentication):
// the key arrives as a Bearer token or as the user name of HTTP Basic auth; a missing or unusable
// key is a 401. This stand-in only ever holds test data, so it takes any `sk_test_` key, and any
// `pk_test_` key for the few calls the browser makes (https://docs.stripe.com/keys).
// Pure: no framework imports.

import { createHash } from 'node:crypto';
import { providerErrors } from '../errors/provider-error';

export const TEST_SECRET_KEY_PREFIX = 'sk_test_';
export const TEST_PUBLISHABLE_KEY_PREFIX = 'pk_test_';

/** A secret key may do everything; a publishable key only what a browser is allowed to. */
export type ApiKeyKind = 'secret' | 'publishable';

export interface ApiKey {
  value: string;
  kind: ApiKeyKind;
}

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

/** Stands for the key where it is kept (idempotency scopes, hence the state file) without holding the key. */
export function apiKeyFingerprint(key: string): string {
  return createHash('sha256').update(key).digest('hex').slice(0, 32);
}

/** Returns the key and its kind when it is a usable test key; throws the provider's 401 otherwise. */
export function requireTestKey(authorization: string | undefined): ApiKey {
  const key = readApiKey(authorization);
  if (key === undefined) throw providerErrors.missingApiKey();
  const prefixes: [string, ApiKeyKind][] = [
    [TEST_SECRET_KEY_PREFIX, 'secret'],
    [TEST_PUBLISHABLE_KEY_PREFIX, 'publishable'],
  ];
  const match = prefixes.find(([prefix]) => key.startsWith(prefix) && key.length > prefix.length);
  if (!match || /\s/.test(key)) throw providerErrors.invalidApiKey(maskApiKey(key));
  return { value: key, kind: match[1] };
}
