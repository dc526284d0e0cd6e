import { createHmac, timingSafeEqual } from 'node:crypto';

/**
 * Signed return addresses for steps done in a lab's external task. The token names the study, the participant's
 * pseudonymous reference, the step, an expiry and the key it was signed with, followed by an HMAC-SHA-256
 * (RFC 2104) over all of them with the study's return key. Changing any character of those fields breaks the
 * signature; a rotated-out key still verifies until its grace period ends.
 */
export interface ReturnLinkClaim {
  studyId: string;
  reference: string;
  stepId: string;
  expiresAt: Date;
}

export interface ReturnKey {
  id: number;
  secret: Buffer;
}

export interface ReturnKeyRing {
  current: ReturnKey;
  /** The key before the last rotation, accepted until `acceptUntil`. */
  previous: (ReturnKey & { acceptUntil: Date }) | null;
}

export type ReturnTokenCheck =
  | { ok: true; claim: ReturnLinkClaim; keyId: number }
  | { ok: false; reason: 'malformed' | 'forged' | 'expired'; claim?: ReturnLinkClaim };

const DOMAIN = 'evenhand-return-v1';
const FIELD = /^[A-Za-z0-9-]{1,64}$/;

export function hmacSha256(key: Buffer, message: Buffer | string): Buffer {
  return createHmac('sha256', key).update(message).digest();
}

function payloadOf(claim: ReturnLinkClaim, keyId: number): string {
  return [claim.studyId, claim.reference, claim.stepId, Math.floor(claim.expiresAt.getTime() / 1000), keyId].join('.');
}

function signatureOf(payload: string, secret: Buffer): string {
  return hmacSha256(secret, `${DOMAIN}\n${payload}`).toString('base64url');
}

export function signReturnToken(claim: ReturnLinkClaim, key: ReturnKey): string {
  for (const field of [claim.studyId, claim.reference, claim.stepId]) {
    if (!FIELD.test(field)) throw new Error(`cannot sign a return link field: ${field}`);
  }
  const payload = payloadOf(claim, key.id);
  return `${payload}.${signatureOf(payload, key.secret)}`;
}

/** Parses without trusting: the claim is only meaningful when `ok` is true. */
export function readReturnToken(
  token: string,
): { claim: ReturnLinkClaim; keyId: number; payload: string; signature: string } | null {
  const parts = token.split('.');
  if (parts.length !== 6) return null;
  const [studyId, reference, stepId, expiry, keyId, signature] = parts;
  if (![studyId, reference, stepId].every((f) => FIELD.test(f))) return null;
  if (!/^\d{1,12}$/.test(expiry) || !/^\d{1,6}$/.test(keyId) || !/^[A-Za-z0-9_-]{43}$/.test(signature)) return null;
  return {
    claim: { studyId, reference, stepId, expiresAt: new Date(Number(expiry) * 1000) },
    keyId: Number(keyId),
    payload: parts.slice(0, 5).join('.'),
    signature,
  };
}

export function verifyReturnToken(token: string, keys: ReturnKeyRing, now: Date): ReturnTokenCheck {
  const read = readReturnToken(token);
  if (!read) return { ok: false, reason: 'malformed' };
  const key =
    read.keyId === keys.current.id
      ? keys.current
      : keys.previous && read.keyId === keys.previous.id && now <= keys.previous.acceptUntil
        ? keys.previous
        : null;
  if (!key) return { ok: false, reason: 'forged', claim: read.claim };
  const expected = Buffer.from(signatureOf(read.payload, key.secret));
  const given = Buffer.from(read.signature);
  if (expected.length !== given.length || !timingSafeEqual(expected, given))
    return { ok: false, reason: 'forged', claim: read.claim };
  if (now > read.claim.expiresAt) return { ok: false, reason: 'expired', claim: read.claim };
  return { ok: true, claim: read.claim, keyId: read.keyId };
}
