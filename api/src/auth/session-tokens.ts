import { createHash, randomBytes } from 'node:crypto';

/** A fresh opaque token (256 bits, URL-safe) and the SHA-256 under which it is stored. */
export function newOpaqueToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}
