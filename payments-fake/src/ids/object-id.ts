import { randomBytes } from 'node:crypto';

const ALPHABET = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz';

/** Random base-62 text from a cryptographic source (ids double as unguessable link tokens). */
export function randomToken(length: number): string {
  const bytes = randomBytes(length * 2);
  let out = '';
  for (let i = 0; out.length < length && i < bytes.length; i++) {
    const byte = bytes[i] as number;
    // 248 = 62 * 4: dropping higher bytes keeps every character equally likely.
    if (byte < 248) out += ALPHABET[byte % 62];
  }
  return out.length === length ? out : out + randomToken(length - out.length);
}

/**
 * Object ids in the provider's style: a short type prefix, an underscore and random text
 * (https://docs.stripe.com/api: `acct_`, `tr_`, `po_`, `pi_`, `evt_`, `req_`, ...).
 */
export function objectId(prefix: string, length = 24): string {
  return `${prefix}_${randomToken(length)}`;
}
