// Idempotent requests as the provider publishes them (https://docs.stripe.com/api/idempotent_requests):
// the first request with a key saves its status and body once the endpoint starts executing;
// a retry with the same key and the same parameters gets that saved result back; the same key with
// other parameters, or on another endpoint, is an idempotency_error; a key whose first request is
// still running is refused; keys are forgotten after 24 hours. Keys are scoped to the secret key and
// the account the request acts for. Pure: no framework imports.

import { canonicalJson } from './canonical-json';

export const IDEMPOTENCY_KEY_MAX_LENGTH = 255;
export const IDEMPOTENCY_TTL_MS = 24 * 60 * 60 * 1000;

export interface SavedResponse {
  status: number;
  body: string;
}

/** A finished request kept under its key, as the state file holds it. */
export interface IdempotencyRecord {
  scope: string;
  key: string;
  endpoint: string;
  /** canonicalJson of the first request's parameters. */
  fingerprint: string;
  requestId: string;
  createdAtMs: number;
  response: SavedResponse;
}

/** A request under its key; it has no response yet while it is still being handled. */
type Entry = Omit<IdempotencyRecord, 'response'> & { response?: SavedResponse };

export type IdempotencyOutcome =
  | { kind: 'fresh' }
  | { kind: 'replay'; response: SavedResponse; originalRequestId: string }
  | { kind: 'params_mismatch' }
  | { kind: 'endpoint_mismatch'; firstEndpoint: string }
  | { kind: 'in_progress' };

export interface IdempotencyRequest {
  scope: string;
  key: string;
  endpoint: string;
  params: unknown;
  requestId: string;
  nowMs: number;
}

export class IdempotencyStore {
  private readonly entries = new Map<string, Entry>();

  constructor(private readonly ttlMs = IDEMPOTENCY_TTL_MS) {}

  private entryKey(scope: string, key: string): string {
    return `${scope}\u0000${key}`;
  }

  /** Looks the key up and, when it is new (or expired), reserves it for this request. */
  begin(request: IdempotencyRequest): IdempotencyOutcome {
    const entryKey = this.entryKey(request.scope, request.key);
    const fingerprint = canonicalJson(request.params);
    const existing = this.entries.get(entryKey);
    if (existing && request.nowMs - existing.createdAtMs < this.ttlMs) {
      if (existing.endpoint !== request.endpoint)
        return { kind: 'endpoint_mismatch', firstEndpoint: existing.endpoint };
      if (existing.fingerprint !== fingerprint) return { kind: 'params_mismatch' };
      if (!existing.response) return { kind: 'in_progress' };
      return { kind: 'replay', response: existing.response, originalRequestId: existing.requestId };
    }
    this.entries.set(entryKey, {
      scope: request.scope,
      key: request.key,
      endpoint: request.endpoint,
      fingerprint,
      requestId: request.requestId,
      createdAtMs: request.nowMs,
    });
    return { kind: 'fresh' };
  }

  /** Saves the result of the reserved request for later replays. */
  complete(scope: string, key: string, response: SavedResponse): void {
    const entry = this.entries.get(this.entryKey(scope, key));
    if (entry) entry.response = response;
  }

  /** Releases a reservation whose result is not kept (validation errors, injected faults). */
  abandon(scope: string, key: string): void {
    const entryKey = this.entryKey(scope, key);
    const entry = this.entries.get(entryKey);
    if (entry && !entry.response) this.entries.delete(entryKey);
  }

  /** The keys of requests still being handled, in any scope. */
  runningKeys(): string[] {
    return [...this.entries.values()].filter((entry) => entry.response === undefined).map((entry) => entry.key);
  }

  clear(): void {
    this.entries.clear();
  }

  /**
   * The finished requests, oldest first. Reservations of requests still running are left out:
   * a restarted process never finishes them, and keeping them would refuse the key for 24 hours.
   */
  toSnapshot(): IdempotencyRecord[] {
    const records: IdempotencyRecord[] = [];
    for (const entry of this.entries.values()) {
      if (entry.response) records.push({ ...entry, response: { ...entry.response } });
    }
    return records;
  }

  restoreSnapshot(records: readonly IdempotencyRecord[]): void {
    this.clear();
    for (const record of records)
      this.entries.set(this.entryKey(record.scope, record.key), { ...record, response: { ...record.response } });
  }
}
