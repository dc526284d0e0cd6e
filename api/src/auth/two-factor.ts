import { createCipheriv, createDecipheriv, createHash, hkdfSync, randomBytes } from 'node:crypto';
import { generate, generateSecret, generateURI, verify } from 'otplib';

/**
 * Time-based one-time passwords (RFC 6238: HMAC-SHA-1, 6 digits, 30-second steps, the defaults every authenticator
 * app reads from an otpauth:// address) and the recovery codes that stand in for a lost phone. Checked against the
 * RFC's own test vectors in two-factor.spec.ts.
 */
export const TOTP_PERIOD_SECONDS = 30;
export const RECOVERY_CODE_COUNT = 10;
const ISSUER = 'Evenhand';

/** A new base32 secret of 160 bits (RFC 4226 recommends at least 128, and 160 for SHA-1). */
export function newTotpSecret(): string {
  return generateSecret({ length: 20 });
}

export function totpAddress(secret: string, email: string): string {
  return generateURI({ issuer: ISSUER, label: email, secret, period: TOTP_PERIOD_SECONDS, digits: 6 });
}

/** The code for a moment (seconds since 1970), for tests and the set-up check. */
export function totpCodeAt(secret: string, epochSeconds: number): Promise<string> {
  return generate({ secret, epoch: epochSeconds, period: TOTP_PERIOD_SECONDS, digits: 6 });
}

/**
 * The 30-second step a typed code belongs to, or null when it matches none. One step either side is allowed for a
 * phone clock that drifts; a step at or before `lastStep` is refused, so an overheard code cannot be used again.
 */
export async function acceptedTotpStep(
  secret: string,
  typed: string,
  epochSeconds: number,
  lastStep: number | null,
): Promise<number | null> {
  const token = typed.replace(/\s+/g, '');
  if (!/^\d{6}$/.test(token)) return null;
  const result = await verify({
    secret,
    token,
    epoch: epochSeconds,
    period: TOTP_PERIOD_SECONDS,
    digits: 6,
    epochTolerance: TOTP_PERIOD_SECONDS,
    ...(lastStep === null ? {} : { afterTimeStep: lastStep }),
  });
  return result.valid ? Math.floor(epochSeconds / TOTP_PERIOD_SECONDS) + result.delta : null;
}

// 32 letters and digits without i, l, o and 1, so a code read off paper is not mistyped.
const RECOVERY_ALPHABET = 'abcdefghjkmnpqrstuvwxyz023456789';

/** Ten codes of ten characters (50 random bits each), shown as `xxxxx-xxxxx`. */
export function newRecoveryCodes(count = RECOVERY_CODE_COUNT): string[] {
  return Array.from({ length: count }, () => {
    const bytes = randomBytes(10);
    const chars = Array.from(bytes, (byte) => RECOVERY_ALPHABET[byte & 31]).join('');
    return `${chars.slice(0, 5)}-${chars.slice(5)}`;
  });
}

/** How a typed recovery code is compared: case, spaces and dashes do not matter. */
export function normalizeRecoveryCode(typed: string): string {
  return typed.toLowerCase().replace(/[\s-]+/g, '');
}

/** Recovery codes are random, so a plain SHA-256 is enough to keep them unreadable at rest. */
export function hashRecoveryCode(typed: string): string {
  return createHash('sha256')
    .update(`recovery-code:${normalizeRecoveryCode(typed)}`)
    .digest('hex');
}

function secretKey(serverSecret: string): Buffer {
  return Buffer.from(hkdfSync('sha256', serverSecret, 'evenhand', 'two-factor secret', 32));
}

/** AES-256-GCM with a key derived from the server secret; the stored text is `v1.<iv>.<tag>.<ciphertext>`. */
export function encryptTotpSecret(secret: string, serverSecret: string): string {
  const iv = randomBytes(12);
  const cipher = createCipheriv('aes-256-gcm', secretKey(serverSecret), iv);
  const sealed = Buffer.concat([cipher.update(secret, 'utf8'), cipher.final()]);
  return ['v1', iv.toString('base64url'), cipher.getAuthTag().toString('base64url'), sealed.toString('base64url')].join(
    '.',
  );
}

export function decryptTotpSecret(stored: string, serverSecret: string): string {
  const [version, iv, tag, sealed] = stored.split('.');
  if (version !== 'v1' || !iv || !tag || !sealed) throw new Error('Unknown two-factor secret format');
  const decipher = createDecipheriv('aes-256-gcm', secretKey(serverSecret), Buffer.from(iv, 'base64url'));
  decipher.setAuthTag(Buffer.from(tag, 'base64url'));
  return Buffer.concat([decipher.update(Buffer.from(sealed, 'base64url')), decipher.final()]).toString('utf8');
}
