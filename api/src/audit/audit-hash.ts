import { createHash, createHmac } from 'node:crypto';

/** previous_hash of the first event of every chain. */
export const GENESIS_HASH = '0'.repeat(64);

/** The action of the keyed event that seals a chain's events written before events were keyed. */
export const UNKEYED_SEAL_ACTION = 'audit.unkeyed-events-sealed';

/** The fields the first, unkeyed scheme hashed (no id, no actor e-mail, no key id). */
export interface ChainedEventFields {
  chain: string;
  sequence: number;
  at: string;
  actorId: string | null;
  action: string;
  subjectType: string | null;
  subjectId: string | null;
  data: Record<string, unknown>;
}

/** Every stored column of an event but its hash. */
export interface StoredEventFields extends ChainedEventFields {
  id: string;
  actorEmail: string | null;
  previousHash: string;
  keyId: string | null;
}

export type StoredEvent = StoredEventFields & { hash: string };

/** JSON with object keys sorted at every depth, so the same event always serialises to the same bytes. */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') return JSON.stringify(value ?? null);
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  const entries = Object.entries(value as Record<string, unknown>)
    .filter(([, v]) => v !== undefined)
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
}

/** The unkeyed scheme: hex SHA-256 of (previous hash as 64 hex chars, then the canonical JSON of the fields above). */
export function chainHash(previousHash: string, event: ChainedEventFields): string {
  return createHash('sha256').update(previousHash).update(canonicalJson(event)).digest('hex');
}

/** HMAC-SHA-256 (RFC 2104) in hex. */
export function hmacHex(key: Buffer, message: string | Buffer): string {
  return createHmac('sha256', key).update(message).digest('hex');
}

/** The keyed scheme: hex HMAC-SHA-256, under the key named by keyId, of the canonical JSON of every stored column. */
export function keyedEventHash(key: Buffer, event: StoredEventFields): string {
  const { id, chain, sequence, at, actorId, actorEmail, action, subjectType, subjectId, data, previousHash, keyId } =
    event;
  return hmacHex(
    key,
    canonicalJson({
      v: 2,
      id,
      chain,
      sequence,
      at,
      actorId,
      actorEmail,
      action,
      subjectType,
      subjectId,
      data,
      previousHash,
      keyId,
    }),
  );
}

/**
 * Folds one unkeyed event, every column included, into a running SHA-256 digest. The seal of a chain's unkeyed
 * events carries the final digest, so a later edit to any of their columns (the actor e-mail too) shows.
 */
export function foldUnkeyedEvent(digest: string, event: StoredEvent): string {
  return createHash('sha256').update(digest).update(canonicalJson(event)).digest('hex');
}

export type ChainBreakReason =
  | 'hash-mismatch'
  | 'previous-hash-mismatch'
  | 'sequence-gap'
  | 'unknown-key'
  | 'unkeyed'
  | 'unkeyed-after-keyed'
  | 'unkeyed-events-changed'
  | 'missing-after-receipt'
  | 'receipt-mismatch';

export interface ChainBreak {
  sequence: number;
  reason: ChainBreakReason;
}

/** Where a walk over a chain stands after some events, so a long chain can be checked page by page. */
export interface ChainWalk {
  sequence: number;
  hash: string;
  keyedSeen: boolean;
  unkeyedCount: number;
  unkeyedDigest: string;
  unkeyedSealed: boolean;
}

export function startWalk(): ChainWalk {
  return {
    sequence: 0,
    hash: GENESIS_HASH,
    keyedSeen: false,
    unkeyedCount: 0,
    unkeyedDigest: GENESIS_HASH,
    unkeyedSealed: false,
  };
}

/**
 * Walks events of one chain in sequence order from `walk` and returns the first link that does not hold (and the
 * walk state after the last good event). Keyed events must carry a known key and a matching HMAC; unkeyed events
 * (written before keys existed) are accepted only when a keyed seal later in the chain covers them all.
 */
export function walkChain(
  events: StoredEvent[],
  walk: ChainWalk,
  keyOf: (keyId: string) => Buffer | undefined,
): { walk: ChainWalk; broken: ChainBreak | null } {
  const state = { ...walk };
  for (const event of events) {
    if (event.sequence !== state.sequence + 1)
      return { walk: state, broken: { sequence: event.sequence, reason: 'sequence-gap' } };
    if (event.previousHash !== state.hash)
      return { walk: state, broken: { sequence: event.sequence, reason: 'previous-hash-mismatch' } };
    if (event.keyId === null) {
      if (state.keyedSeen) return { walk: state, broken: { sequence: event.sequence, reason: 'unkeyed-after-keyed' } };
      const { id: _id, actorEmail: _email, previousHash, keyId: _keyId, hash, ...fields } = event;
      if (chainHash(previousHash, fields) !== hash)
        return { walk: state, broken: { sequence: event.sequence, reason: 'hash-mismatch' } };
      state.unkeyedCount += 1;
      state.unkeyedDigest = foldUnkeyedEvent(state.unkeyedDigest, event);
    } else {
      const key = keyOf(event.keyId);
      if (!key) return { walk: state, broken: { sequence: event.sequence, reason: 'unknown-key' } };
      const { hash, ...fields } = event;
      if (keyedEventHash(key, fields) !== hash)
        return { walk: state, broken: { sequence: event.sequence, reason: 'hash-mismatch' } };
      if (!state.keyedSeen && state.unkeyedCount > 0) {
        const seal = event.action === UNKEYED_SEAL_ACTION ? event.data : null;
        if (!seal) return { walk: state, broken: { sequence: 1, reason: 'unkeyed' } };
        if (seal.unkeyedThrough !== state.unkeyedCount || seal.unkeyedDigest !== state.unkeyedDigest) {
          return { walk: state, broken: { sequence: event.sequence, reason: 'unkeyed-events-changed' } };
        }
        state.unkeyedSealed = true;
      }
      state.keyedSeen = true;
    }
    state.sequence = event.sequence;
    state.hash = event.hash;
  }
  return { walk: state, broken: null };
}

/** After the last event: unkeyed events that no keyed seal covers are never reported intact. */
export function finishWalk(walk: ChainWalk): ChainBreak | null {
  return walk.unkeyedCount > 0 && !walk.unkeyedSealed ? { sequence: 1, reason: 'unkeyed' } : null;
}

/** What each reason means, in words an auditor can act on. */
export function describeBreak(chain: string, broken: ChainBreak, receiptId?: string | null): string {
  const at = `event ${broken.sequence} of chain ${chain}`;
  switch (broken.reason) {
    case 'hash-mismatch':
      return `${at} does not match its keyed hash: a stored column was changed after it was written.`;
    case 'previous-hash-mismatch':
      return `${at} does not link to the event before it: events were removed, inserted or rewritten before it.`;
    case 'sequence-gap':
      return `${at} follows a gap in the sequence: the event before it is missing.`;
    case 'unknown-key':
      return `${at} names a key this server does not hold; configure that key to check it.`;
    case 'unkeyed':
      return `Chain ${chain} holds events written before events were keyed that no keyed seal covers, starting at event 1.`;
    case 'unkeyed-after-keyed':
      return `${at} carries no key although keyed events come before it: it was added outside the api.`;
    case 'unkeyed-events-changed':
      return `${at} seals the events written before keying, and they no longer match it: one of events 1–${broken.sequence - 1} was changed or removed.`;
    case 'missing-after-receipt':
      return `${at} is missing although audit receipt ${receiptId ?? ''} sealed the chain up to a later event: events were deleted.`;
    case 'receipt-mismatch':
      return `${at} differs from the head that audit receipt ${receiptId ?? ''} sealed: the chain was rewritten after the receipt.`;
  }
}
