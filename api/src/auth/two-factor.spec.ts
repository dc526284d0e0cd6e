import { generate } from 'otplib';
import { describe, expect, it } from 'vitest';
import {
  acceptedTotpStep,
  decryptTotpSecret,
  encryptTotpSecret,
  hashRecoveryCode,
  newRecoveryCodes,
  newTotpSecret,
  totpAddress,
  totpCodeAt,
} from './two-factor';

// RFC 6238 Appendix B: the SHA-1 seed is the ASCII string "12345678901234567890"; 8-digit codes at these times.
const RFC_6238_SHA1 = [
  [59, '94287082'],
  [1111111109, '07081804'],
  [1111111111, '14050471'],
  [1234567890, '89005924'],
  [2000000000, '69279037'],
  [20000000000, '65353130'],
] as const;
// The same seed in base32 (RFC 4648), as our code stores secrets.
const RFC_SEED_BASE32 = 'GEZDGNBVGY3TQOJQGEZDGNBVGY3TQOJQ';

describe('time-based codes', () => {
  it.each(RFC_6238_SHA1)('matches RFC 6238 Appendix B at T=%i (SHA-1, 8 digits) through otplib', async (time, code) => {
    expect(await generate({ secret: RFC_SEED_BASE32, epoch: time, digits: 8, period: 30 })).toBe(code);
  });

  it('gives the last six digits of the RFC vector at T=59 as our six-digit code (RFC 4226 truncation)', async () => {
    // 94287082 mod 10^6 = 287082: a 6-digit code is the same truncated value taken modulo 10^6.
    expect(await totpCodeAt(RFC_SEED_BASE32, 59)).toBe('287082');
  });

  it('accepts the current code and one step either side, and never the same step twice', async () => {
    const secret = newTotpSecret();
    const now = 1_800_000_000;
    const step = Math.floor(now / 30);
    expect(await acceptedTotpStep(secret, await totpCodeAt(secret, now), now, null)).toBe(step);
    expect(await acceptedTotpStep(secret, await totpCodeAt(secret, now - 30), now, null)).toBe(step - 1);
    expect(await acceptedTotpStep(secret, await totpCodeAt(secret, now - 90), now, null)).toBeNull();
    expect(await acceptedTotpStep(secret, await totpCodeAt(secret, now), now, step)).toBeNull();
    expect(await acceptedTotpStep(secret, 'abcdef', now, null)).toBeNull();
  });

  it('names the issuer and the account in the authenticator address', () => {
    const address = totpAddress('JBSWY3DPEHPK3PXP', 'pat@lab.example');
    expect(address).toMatch(/^otpauth:\/\/totp\/Evenhand:pat%40lab\.example\?/);
    expect(address).toContain('secret=JBSWY3DPEHPK3PXP');
  });
});

describe('keeping the secret and recovery codes', () => {
  it('encrypts the secret so the stored text does not contain it, and only the same server secret opens it', () => {
    const sealed = encryptTotpSecret('JBSWY3DPEHPK3PXP', 'server-secret-a');
    expect(sealed).not.toContain('JBSWY3DPEHPK3PXP');
    expect(decryptTotpSecret(sealed, 'server-secret-a')).toBe('JBSWY3DPEHPK3PXP');
    expect(() => decryptTotpSecret(sealed, 'server-secret-b')).toThrow();
  });

  it('makes ten different codes and hashes them whatever the case or dashes typed', () => {
    const codes = newRecoveryCodes();
    expect(codes).toHaveLength(10);
    expect(new Set(codes).size).toBe(10);
    for (const code of codes) expect(code).toMatch(/^[a-z0-9]{5}-[a-z0-9]{5}$/);
    expect(hashRecoveryCode(codes[0])).toBe(hashRecoveryCode(` ${codes[0].toUpperCase().replace('-', ' ')} `));
    expect(hashRecoveryCode(codes[0])).not.toBe(hashRecoveryCode(codes[1]));
  });
});
