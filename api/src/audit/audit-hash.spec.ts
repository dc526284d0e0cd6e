import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import {
  canonicalJson,
  ChainedEventFields,
  chainHash,
  finishWalk,
  GENESIS_HASH,
  hmacHex,
  keyedEventHash,
  startWalk,
  StoredEvent,
  UNKEYED_SEAL_ACTION,
  walkChain,
} from './audit-hash';

function event(sequence: number, data: Record<string, unknown> = {}): ChainedEventFields {
  return {
    chain: 'lab',
    sequence,
    at: `2026-01-0${sequence}T10:00:00.000Z`,
    actorId: null,
    action: 'auth.sign-in',
    subjectType: 'user',
    subjectId: 'u1',
    data,
  };
}

const KEY = Buffer.alloc(32, 7);
const keyOf = (id: string) => (id === 'k1' ? KEY : undefined);

function keyedChainOf(count: number, after: StoredEvent[] = []): StoredEvent[] {
  const events = [...after];
  let previousHash = after.length ? after[after.length - 1].hash : GENESIS_HASH;
  for (let sequence = after.length + 1; sequence <= after.length + count; sequence++) {
    const fields = {
      ...event(sequence, { n: sequence }),
      id: `e${sequence}`,
      actorEmail: 'a@b.test',
      previousHash,
      keyId: 'k1',
    };
    const hash = keyedEventHash(KEY, fields);
    events.push({ ...fields, hash });
    previousHash = hash;
  }
  return events;
}

function unkeyedChainOf(count: number): StoredEvent[] {
  const events: StoredEvent[] = [];
  let previousHash = GENESIS_HASH;
  for (let sequence = 1; sequence <= count; sequence++) {
    const fields = event(sequence, { n: sequence });
    const hash = chainHash(previousHash, fields);
    events.push({ ...fields, id: `u${sequence}`, actorEmail: 'old@b.test', previousHash, keyId: null, hash });
    previousHash = hash;
  }
  return events;
}

const check = (events: StoredEvent[]) => {
  const { walk, broken } = walkChain(events, startWalk(), keyOf);
  return broken ?? finishWalk(walk);
};

describe('canonicalJson', () => {
  it('sorts keys at every depth and drops undefined', () => {
    expect(canonicalJson({ b: 1, a: { d: [2, { z: 1, y: 0 }], c: undefined } })).toBe(
      '{"a":{"d":[2,{"y":0,"z":1}]},"b":1}',
    );
  });
});

describe('chainHash', () => {
  it('equals the SHA-256 that sha256sum computes over the documented bytes', () => {
    const fields = event(1, { email: 'a@b.test' });
    const bytes = GENESIS_HASH + canonicalJson(fields);
    // Outside check: coreutils sha256sum (FIPS 180-4 SHA-256) over the same byte layout.
    const reference = execFileSync('sha256sum', { input: bytes }).toString().split(' ')[0];
    expect(chainHash(GENESIS_HASH, fields)).toBe(reference);
  });
});

describe('hmacHex', () => {
  // RFC 4231 (HMAC-SHA-256 test vectors), test cases 1, 2 and 6.
  it('matches RFC 4231 test case 1', () => {
    expect(hmacHex(Buffer.alloc(20, 0x0b), 'Hi There')).toBe(
      'b0344c61d8db38535ca8afceaf0bf12b881dc200c9833da726e9376c2e32cff7',
    );
  });
  it('matches RFC 4231 test case 2', () => {
    expect(hmacHex(Buffer.from('Jefe'), 'what do ya want for nothing?')).toBe(
      '5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843',
    );
  });
  it('matches RFC 4231 test case 6 (key longer than the block)', () => {
    expect(hmacHex(Buffer.alloc(131, 0xaa), 'Test Using Larger Than Block-Size Key - Hash Key First')).toBe(
      '60e431591ee0b67f0d8a26aacbf5b77f8e0bc6213728c5140546040f0ee37f54',
    );
  });
});

describe('walkChain', () => {
  it('accepts an intact keyed chain', () => {
    expect(check(keyedChainOf(5))).toBeNull();
  });

  it('finds an altered event, the actor e-mail included', () => {
    const events = keyedChainOf(5);
    events[2] = { ...events[2], actorEmail: 'someone@else.test' };
    expect(check(events)).toEqual({ sequence: 3, reason: 'hash-mismatch' });
  });

  it('finds an event rewritten and re-linked with plain SHA-256 (no key)', () => {
    const events = keyedChainOf(3);
    const { hash: _h, ...fields } = events[1];
    events[1] = { ...fields, data: { n: 99 }, hash: chainHash(fields.previousHash, { ...event(2, { n: 99 }) }) };
    expect(check(events)).toEqual({ sequence: 2, reason: 'hash-mismatch' });
  });

  it('finds a removed event and a relinked one', () => {
    const removed = keyedChainOf(5);
    removed.splice(1, 1);
    expect(check(removed)).toEqual({ sequence: 3, reason: 'sequence-gap' });
    const relinked = keyedChainOf(3);
    relinked[1] = { ...relinked[1], previousHash: GENESIS_HASH };
    expect(check(relinked)?.reason).toBe('previous-hash-mismatch');
  });

  it('names an event made with a key it does not hold', () => {
    const events = keyedChainOf(2);
    events[1] = { ...events[1], keyId: 'k9' };
    expect(check(events)).toEqual({ sequence: 2, reason: 'unknown-key' });
  });

  it('never calls unkeyed events intact until a keyed seal covers them, and then catches edits to any column', () => {
    const unkeyed = unkeyedChainOf(3);
    expect(check(unkeyed)).toEqual({ sequence: 1, reason: 'unkeyed' });
    let walk = walkChain(unkeyed, startWalk(), keyOf).walk;
    const sealFields = {
      ...event(4, { unkeyedThrough: walk.unkeyedCount, unkeyedDigest: walk.unkeyedDigest }),
      action: UNKEYED_SEAL_ACTION,
      id: 's4',
      actorEmail: null,
      previousHash: unkeyed[2].hash,
      keyId: 'k1',
    };
    const sealed = [...unkeyed, { ...sealFields, hash: keyedEventHash(KEY, sealFields) }];
    expect(check(sealed)).toBeNull();
    const edited = sealed.map((e, i) => (i === 1 ? { ...e, actorEmail: 'forged@b.test' } : e));
    expect(check(edited)).toEqual({ sequence: 4, reason: 'unkeyed-events-changed' });
    expect(
      check([
        ...sealed,
        ...unkeyedChainOf(5)
          .slice(4)
          .map((e) => ({ ...e, previousHash: sealed[3].hash })),
      ]),
    ).toEqual({ sequence: 5, reason: 'unkeyed-after-keyed' });
    walk = startWalk();
    expect(walk.unkeyedCount).toBe(0);
  });

  it('checks a long chain page by page with the same result', () => {
    const events = keyedChainOf(10);
    const first = walkChain(events.slice(0, 4), startWalk(), keyOf);
    expect(first.broken).toBeNull();
    expect(walkChain(events.slice(4), first.walk, keyOf).broken).toBeNull();
  });
});
