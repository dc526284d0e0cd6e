import { createHash } from 'node:crypto';

/** previous_hash of the first event of every chain. */
export const GENESIS_HASH = '0'.repeat(64);

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

/** JSON with object keys sorted at every depth, so the same event always serialises to the same bytes. */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') return JSON.stringify(value ?? null);
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  const entries = Object.entries(value as Record<string, unknown>)
    .filter(([, v]) => v !== undefined)
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
}

/** hash = hex SHA-256 of (previous hash as 64 hex chars, then the canonical JSON of the event's fields). */
export function chainHash(previousHash: string, event: ChainedEventFields): string {
  return createHash('sha256').update(previousHash).update(canonicalJson(event)).digest('hex');
}

export interface ChainBreak {
  sequence: number;
  reason: 'hash-mismatch' | 'previous-hash-mismatch' | 'sequence-gap';
}

/**
 * Walks one chain in sequence order and reports the first link that does not hold. `after` is the last link
 * already verified, so a long chain can be checked page by page.
 */
export function findChainBreak(
  events: Array<ChainedEventFields & { previousHash: string; hash: string }>,
  after: { sequence: number; hash: string } = { sequence: 0, hash: GENESIS_HASH },
): ChainBreak | null {
  let previousHash = after.hash;
  let expectedSequence = after.sequence + 1;
  for (const event of events) {
    if (event.sequence !== expectedSequence) return { sequence: event.sequence, reason: 'sequence-gap' };
    if (event.previousHash !== previousHash) return { sequence: event.sequence, reason: 'previous-hash-mismatch' };
    const { previousHash: _p, hash, ...fields } = event;
    if (chainHash(previousHash, fields) !== hash) return { sequence: event.sequence, reason: 'hash-mismatch' };
    previousHash = hash;
    expectedSequence += 1;
  }
  return null;
}
