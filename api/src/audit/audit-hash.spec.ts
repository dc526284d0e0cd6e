import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { canonicalJson, ChainedEventFields, chainHash, findChainBreak, GENESIS_HASH } from './audit-hash';

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

function chainOf(count: number) {
  const events = [];
  let previousHash = GENESIS_HASH;
  for (let sequence = 1; sequence <= count; sequence++) {
    const fields = event(sequence, { n: sequence });
    const hash = chainHash(previousHash, fields);
    events.push({ ...fields, previousHash, hash });
    previousHash = hash;
  }
  return events;
}

describe('canonicalJson', () => {
  it('sorts keys at every depth and drops undefined', () => {
    expect(canonicalJson({ b: 1, a: { d: [2, { z: 1, y: 0 }], c: undefined } })).toBe('{"a":{"d":[2,{"y":0,"z":1}]},"b":1}');
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

describe('findChainBreak', () => {
  it('accepts an intact chain', () => {
    expect(findChainBreak(chainOf(5))).toBeNull();
  });

  it('finds an altered event', () => {
    const events = chainOf(5);
    events[2] = { ...events[2], data: { n: 99 } };
    expect(findChainBreak(events)).toEqual({ sequence: 3, reason: 'hash-mismatch' });
  });

  it('finds a removed event', () => {
    const events = chainOf(5);
    events.splice(1, 1);
    expect(findChainBreak(events)).toEqual({ sequence: 3, reason: 'sequence-gap' });
  });

  it('finds a relinked event', () => {
    const events = chainOf(3);
    events[1] = { ...events[1], previousHash: GENESIS_HASH };
    expect(findChainBreak(events)?.reason).toBe('previous-hash-mismatch');
  });
});
