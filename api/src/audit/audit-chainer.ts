import { randomUUID } from 'node:crypto';
import { Pool, PoolClient } from 'pg';
import { GENESIS_HASH, keyedEventHash, StoredEventFields } from './audit-hash';

/** Outbox rows sealed per transaction; a longer backlog is sealed in several. */
const SEAL_BATCH = 1000;

interface OutboxRow {
  id: string;
  actor_id: string | null;
  actor_email: string | null;
  action: string;
  subject_type: string | null;
  subject_id: string | null;
  data: Record<string, unknown>;
}

interface Waiter {
  promise: Promise<void>;
  resolve: () => void;
}

function waiter(): Waiter {
  let resolve!: () => void;
  const promise = new Promise<void>((done) => (resolve = done));
  return { promise, resolve };
}

/**
 * Seals a chain's waiting outbox rows into audit_event: one chainer per chain at a time (in this process by the
 * loop below, across processes by the chain's advisory lock), each run taking every row committed before it
 * started, so many signings share one sealing transaction. It works on its own small pool: callers wait for it
 * while holding a connection of the app's pool, and must never wait for that pool to free one.
 */
export class AuditChainer {
  private readonly chains = new Map<string, { next: Waiter | null }>();

  constructor(
    private readonly pool: Pool,
    private readonly currentKey: () => { id: string; key: Buffer },
    private readonly onError: (chain: string, error: Error) => void,
  ) {}

  /**
   * Resolves once a seal of the chain that started after this call has finished (rows committed before the call
   * are then in audit_event). Never rejects: a failed seal leaves the rows in the outbox for the next one.
   */
  seal(chain: string): Promise<void> {
    const state = this.chains.get(chain);
    if (state) {
      state.next ??= waiter();
      return state.next.promise;
    }
    const first = waiter();
    const fresh = { next: first as Waiter | null };
    this.chains.set(chain, fresh);
    void this.run(chain, fresh);
    return first.promise;
  }

  private async run(chain: string, state: { next: Waiter | null }): Promise<void> {
    while (state.next) {
      const batch = state.next;
      state.next = null;
      try {
        while ((await this.sealOnce(chain)) === SEAL_BATCH);
      } catch (error) {
        this.onError(chain, error as Error);
      }
      batch.resolve();
    }
    this.chains.delete(chain);
  }

  /** One sealing transaction: lock the chain, read its head and waiting rows, write them as events, delete them. */
  private async sealOnce(chain: string): Promise<number> {
    const client: PoolClient = await this.pool.connect();
    let failed = false;
    try {
      await client.query('BEGIN');
      await client.query(`SELECT pg_advisory_xact_lock(hashtextextended($1, 0))`, [`audit:${chain}`]);
      const { rows } = await client.query<OutboxRow & { head_sequence: number | null; head_hash: string | null }>(
        `SELECT o.id::text, o.actor_id, o.actor_email, o.action, o.subject_type, o.subject_id, o.data, h.sequence AS head_sequence, h.hash AS head_hash
         FROM (SELECT sequence, hash FROM audit_event WHERE chain = $1 ORDER BY sequence DESC LIMIT 1) h
         RIGHT JOIN (SELECT * FROM audit_outbox WHERE chain = $1 ORDER BY id LIMIT $2) o ON true
         ORDER BY o.id`,
        [chain, SEAL_BATCH],
      );
      if (rows.length === 0) {
        await client.query('COMMIT');
        return 0;
      }
      let sequence = rows[0].head_sequence === null ? 0 : Number(rows[0].head_sequence);
      let previousHash = rows[0].head_hash ?? GENESIS_HASH;
      // Stamped under the lock, so a chain's times never go backwards as its sequence goes up.
      const at = new Date().toISOString();
      const { id: keyId, key } = this.currentKey();
      const events = rows.map((row) => {
        sequence += 1;
        const fields: StoredEventFields = {
          id: randomUUID(),
          chain,
          sequence,
          at,
          actorId: row.actor_id,
          actorEmail: row.actor_email,
          action: row.action,
          subjectType: row.subject_type,
          subjectId: row.subject_id,
          // As jsonb hands it back: the outbox stored it as jsonb already, and audit_event stores the same value.
          data: row.data,
          previousHash,
          keyId,
        };
        const hash = keyedEventHash(key, fields);
        previousHash = hash;
        return { ...fields, hash };
      });
      await client.query(
        `WITH sealed AS (DELETE FROM audit_outbox WHERE id = ANY($2::bigint[]))
         INSERT INTO audit_event (id, chain, sequence, at, actor_id, actor_email, action, subject_type, subject_id, data, previous_hash, hash, key_id)
         SELECT (e->>'id')::uuid, e->>'chain', (e->>'sequence')::int, (e->>'at')::timestamptz, (e->>'actorId')::uuid, e->>'actorEmail', e->>'action',
                e->>'subjectType', e->>'subjectId', e->'data', e->>'previousHash', e->>'hash', e->>'keyId'
         FROM jsonb_array_elements($1::jsonb) e`,
        [JSON.stringify(events), rows.map((row) => row.id)],
      );
      await client.query('COMMIT');
      return rows.length;
    } catch (error) {
      failed = true;
      await client.query('ROLLBACK').catch(() => undefined);
      throw error;
    } finally {
      client.release(failed);
    }
  }

  /** Chains with rows still waiting (after a crash between commit and seal, or a failed seal). */
  async waitingChains(): Promise<string[]> {
    const { rows } = await this.pool.query<{ chain: string }>(`SELECT DISTINCT chain FROM audit_outbox ORDER BY chain`);
    return rows.map((row) => row.chain);
  }
}
