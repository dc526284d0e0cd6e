import { describe, expect, it } from 'vitest';
import { groupedFingerprint, shortFingerprint } from './fingerprint';

// SHA-256("abc") from FIPS 180-2, appendix B.1 (NIST's published example), recomputed with Web Crypto.
const abc = 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad';

describe('consent form fingerprint as shown', () => {
  it('is the published SHA-256 example, so the tests use a real fingerprint', async () => {
    const digest = await crypto.subtle.digest('SHA-256', new TextEncoder().encode('abc'));
    expect([...new Uint8Array(digest)].map((byte) => byte.toString(16).padStart(2, '0')).join('')).toBe(abc);
  });

  it('shortens to the first and last eight characters', () => {
    expect(shortFingerprint(abc)).toBe('ba7816bf…f20015ad');
  });

  it('shows a short value whole and lower-cases what it is given', () => {
    expect(shortFingerprint('ABCDEF')).toBe('abcdef');
    expect(shortFingerprint(abc.toUpperCase())).toBe('ba7816bf…f20015ad');
  });

  it('groups the whole fingerprint in sixteen blocks of four that join back to it', () => {
    const groups = groupedFingerprint(abc);
    expect(groups).toHaveLength(16);
    expect(groups.slice(0, 3)).toEqual(['ba78', '16bf', '8f01']);
    expect(groups.join('')).toBe(abc);
  });
});
