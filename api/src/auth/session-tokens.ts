import { createHash, createHmac, randomBytes } from 'node:crypto';

/** A fresh opaque token (256 bits, URL-safe) and the SHA-256 under which it is stored. */
export function newOpaqueToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

/**
 * The refresh token that replaces `token` when it is rotated. Derived with a server key rather than drawn at random, so
 * a second refresh racing the first within the grace window can be given the very same successor (only hashes are
 * stored); without the key, knowing a token reveals nothing about the next one.
 */
export function successorToken(key: string, token: string): string {
  return createHmac('sha256', key).update(`refresh-successor:${token}`).digest('base64url');
}

/** The token of the sign-in link made by one link-request job: the same however often the job runs. */
export function signInLinkToken(key: string, jobId: string): string {
  return createHmac('sha256', key).update(`sign-in-link:${jobId}`).digest('base64url');
}

/** The token of the password-reset link made by one reset-request job: the same however often the job runs. */
export function passwordResetToken(key: string, jobId: string): string {
  return createHmac('sha256', key).update(`password-reset:${jobId}`).digest('base64url');
}
