import { describe, expect, it } from 'vitest';
import { hmacSha256, signReturnToken, verifyReturnToken, type ReturnKeyRing } from './return-link';

// HMAC-SHA-256 test vectors from RFC 4231 ("Identifiers and Test Vectors for HMAC-SHA-224, -256, -384 and -512"),
// section 4: test cases 1, 2, 3, 4, 6 and 7 (case 5 checks truncated output, which we never use).
const RFC_4231_CASES = [
  {
    name: 'case 1',
    key: '0b'.repeat(20),
    data: Buffer.from('Hi There'),
    mac: 'b0344c61d8db38535ca8afceaf0bf12b881dc200c9833da726e9376c2e32cff7',
  },
  {
    name: 'case 2',
    key: Buffer.from('Jefe').toString('hex'),
    data: Buffer.from('what do ya want for nothing?'),
    mac: '5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843',
  },
  {
    name: 'case 3',
    key: 'aa'.repeat(20),
    data: Buffer.from('dd'.repeat(50), 'hex'),
    mac: '773ea91e36800e46854db8ebd09181a72959098b3ef8c122d9635514ced565fe',
  },
  {
    name: 'case 4',
    key: '0102030405060708090a0b0c0d0e0f10111213141516171819',
    data: Buffer.from('cd'.repeat(50), 'hex'),
    mac: '82558a389a443c0ea4cc819899f2083a85f0faa3e578f8077a2e3ff46729665b',
  },
  {
    name: 'case 6',
    key: 'aa'.repeat(131),
    data: Buffer.from('Test Using Larger Than Block-Size Key - Hash Key First'),
    mac: '60e431591ee0b67f0d8a26aacbf5b77f8e0bc6213728c5140546040f0ee37f54',
  },
  {
    name: 'case 7',
    key: 'aa'.repeat(131),
    data: Buffer.from(
      'This is a test using a larger than block-size key and a larger than block-size data. The key needs to be hashed before being used by the HMAC algorithm.',
    ),
    mac: '9b09ffa71b942fcb27635fbcd5b0e944bfdc63644f0713938a7f51535c3a35e2',
  },
];

describe('hmacSha256', () => {
  it.each(RFC_4231_CASES)('matches RFC 4231 $name', ({ key, data, mac }) => {
    expect(hmacSha256(Buffer.from(key, 'hex'), data).toString('hex')).toBe(mac);
  });
});

const now = new Date('2026-05-01T12:00:00Z');
const claim = {
  studyId: '6f1c2d34-1111-4aaa-8bbb-000000000001',
  reference: 'P-ABC234',
  stepId: '6f1c2d34-2222-4aaa-8bbb-000000000002',
  expiresAt: new Date('2026-05-08T12:00:00Z'),
};
const current = { id: 2, secret: Buffer.alloc(32, 7) };
const previous = { id: 1, secret: Buffer.alloc(32, 3), acceptUntil: new Date('2026-05-03T00:00:00Z') };
const ring: ReturnKeyRing = { current, previous };

function flip(char: string): string {
  return char === 'A' ? 'B' : char === '0' ? '1' : char === '-' ? 'X' : 'A';
}

describe('return links', () => {
  it('verifies a link it signed', () => {
    const check = verifyReturnToken(signReturnToken(claim, current), ring, now);
    expect(check).toEqual({ ok: true, claim, keyId: 2 });
  });

  it('refuses a link when any character of the study, reference, step or expiry is changed', () => {
    const token = signReturnToken(claim, current);
    const signedPart = token.lastIndexOf('.', token.lastIndexOf('.') - 1);
    for (let i = 0; i < signedPart; i++) {
      if (token[i] === '.') continue;
      const tampered = token.slice(0, i) + flip(token[i]) + token.slice(i + 1);
      const check = verifyReturnToken(tampered, ring, now);
      expect(check.ok, `character ${i} of ${token}`).toBe(false);
    }
  });

  it('refuses a changed signature and a link signed with another secret', () => {
    const token = signReturnToken(claim, current);
    expect(verifyReturnToken(token.slice(0, -1) + flip(token.slice(-1)), ring, now)).toMatchObject({
      ok: false,
      reason: 'forged',
    });
    expect(verifyReturnToken(signReturnToken(claim, { id: 2, secret: Buffer.alloc(32, 9) }), ring, now)).toMatchObject({
      ok: false,
      reason: 'forged',
    });
  });

  it('refuses an expired link', () => {
    const token = signReturnToken(claim, current);
    expect(verifyReturnToken(token, ring, new Date('2026-05-08T12:00:01Z'))).toMatchObject({
      ok: false,
      reason: 'expired',
    });
  });

  it('accepts links signed with the previous key during the grace period only', () => {
    const token = signReturnToken(claim, previous);
    expect(verifyReturnToken(token, ring, now)).toMatchObject({ ok: true, keyId: 1 });
    expect(verifyReturnToken(token, ring, new Date('2026-05-03T00:00:01Z'))).toMatchObject({
      ok: false,
      reason: 'forged',
    });
    expect(verifyReturnToken(token, { current, previous: null }, now)).toMatchObject({ ok: false, reason: 'forged' });
  });

  it('treats garbage as malformed', () => {
    for (const token of [
      '',
      'a.b.c',
      `${'x'.repeat(65)}.P-1.s.1.1.${'A'.repeat(43)}`,
      signReturnToken(claim, current) + '.extra',
    ]) {
      expect(verifyReturnToken(token, ring, now)).toMatchObject({ ok: false, reason: 'malformed' });
    }
  });
});
