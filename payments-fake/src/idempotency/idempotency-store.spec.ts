import { describe, expect, it } from 'vitest';
import { canonicalJson } from './canonical-json';
import { IDEMPOTENCY_TTL_MS, IdempotencyStore } from './idempotency-store';

// Behaviour as published at https://docs.stripe.com/api/idempotent_requests.
const base = {
  scope: 'sk_test_a|acct_platform',
  key: 'k1',
  endpoint: 'POST /v1/transfers',
  requestId: 'req_1',
  nowMs: 0,
};

describe('IdempotencyStore', () => {
  it('reserves a new key, then replays the saved answer for the same parameters', () => {
    const store = new IdempotencyStore();
    expect(store.begin({ ...base, params: { amount: '100' } })).toEqual({ kind: 'fresh' });
    store.complete(base.scope, 'k1', { status: 200, body: '{"id":"tr_1"}' });
    expect(store.begin({ ...base, params: { amount: '100' }, requestId: 'req_2' })).toEqual({
      kind: 'replay',
      response: { status: 200, body: '{"id":"tr_1"}' },
      originalRequestId: 'req_1',
    });
  });

  it('flags other parameters and another endpoint', () => {
    const store = new IdempotencyStore();
    store.begin({ ...base, params: { amount: '100' } });
    store.complete(base.scope, 'k1', { status: 200, body: '{}' });
    expect(store.begin({ ...base, params: { amount: '101' } })).toEqual({ kind: 'params_mismatch' });
    expect(store.begin({ ...base, endpoint: 'POST /v1/payouts', params: { amount: '100' } })).toEqual({
      kind: 'endpoint_mismatch',
      firstEndpoint: 'POST /v1/transfers',
    });
  });

  it('says in_progress while the first request has not finished', () => {
    const store = new IdempotencyStore();
    store.begin({ ...base, params: {} });
    expect(store.begin({ ...base, params: {} })).toEqual({ kind: 'in_progress' });
    expect(store.runningKeys()).toEqual(['k1']);
    store.complete(base.scope, 'k1', { status: 200, body: '{}' });
    expect(store.runningKeys()).toEqual([]);
  });

  it('forgets an abandoned reservation but never a saved answer', () => {
    const store = new IdempotencyStore();
    store.begin({ ...base, params: {} });
    store.abandon(base.scope, 'k1');
    expect(store.begin({ ...base, params: { other: '1' } })).toEqual({ kind: 'fresh' });
    store.complete(base.scope, 'k1', { status: 400, body: '{"error":{}}' });
    store.abandon(base.scope, 'k1');
    expect(store.begin({ ...base, params: { other: '1' } }).kind).toBe('replay');
  });

  it('keeps keys apart by scope', () => {
    const store = new IdempotencyStore();
    store.begin({ ...base, params: {} });
    expect(store.begin({ ...base, scope: 'sk_test_a|acct_connected', params: { x: '1' } })).toEqual({ kind: 'fresh' });
  });

  it('treats a key older than 24 hours as new', () => {
    const store = new IdempotencyStore();
    expect(IDEMPOTENCY_TTL_MS).toBe(24 * 60 * 60 * 1000);
    store.begin({ ...base, params: {} });
    store.complete(base.scope, 'k1', { status: 200, body: '{}' });
    expect(store.begin({ ...base, params: { x: '1' }, nowMs: IDEMPOTENCY_TTL_MS - 1 }).kind).toBe('params_mismatch');
    expect(store.begin({ ...base, params: { x: '1' }, nowMs: IDEMPOTENCY_TTL_MS })).toEqual({ kind: 'fresh' });
  });
});

describe('canonicalJson', () => {
  it('ignores key order but not list order', () => {
    expect(canonicalJson({ b: '1', a: { d: '2', c: '3' } })).toBe(canonicalJson({ a: { c: '3', d: '2' }, b: '1' }));
    expect(canonicalJson({ expand: ['a', 'b'] })).not.toBe(canonicalJson({ expand: ['b', 'a'] }));
    // Agrees with JSON.stringify where key order is already sorted (outside reference: ECMA-262 JSON.stringify).
    const sorted = { a: [1, 'x', null, true], b: { c: 'é"\\' } };
    expect(canonicalJson(sorted)).toBe(JSON.stringify(sorted));
  });
});

describe('IdempotencyStore snapshots', () => {
  it('keeps finished requests, so a restored store still replays them and flags other parameters', () => {
    const store = new IdempotencyStore();
    store.begin({ ...base, params: { amount: '100' } });
    store.complete(base.scope, 'k1', { status: 200, body: '{"id":"tr_1"}' });
    const copy = new IdempotencyStore();
    copy.restoreSnapshot(JSON.parse(JSON.stringify(store.toSnapshot())));
    expect(copy.begin({ ...base, params: { amount: '100' }, requestId: 'req_9', nowMs: 1_000 })).toEqual({
      kind: 'replay',
      response: { status: 200, body: '{"id":"tr_1"}' },
      originalRequestId: 'req_1',
    });
    expect(copy.begin({ ...base, params: { amount: '101' }, nowMs: 1_000 })).toEqual({ kind: 'params_mismatch' });
    // Still forgotten 24 hours after the first request, counted from its saved time.
    expect(copy.begin({ ...base, params: { amount: '101' }, nowMs: IDEMPOTENCY_TTL_MS })).toEqual({ kind: 'fresh' });
  });

  it('leaves out a request still running, whose key a restarted process could never release', () => {
    const store = new IdempotencyStore();
    store.begin({ ...base, params: {} });
    expect(store.toSnapshot()).toEqual([]);
  });
});
