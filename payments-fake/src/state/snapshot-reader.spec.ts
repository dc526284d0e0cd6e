import type Stripe from 'stripe';
import { describe, expect, it } from 'vitest';
import { worldOptions } from '../app/payments-fake-app';
import { ProviderWorld } from './provider-world';
import { readWorldSnapshot, SnapshotError } from './snapshot-reader';
import { restoreWorld, snapshotText, worldState, type WorldSnapshot } from './world-snapshot';

function newWorld(): ProviderWorld {
  return new ProviderWorld(worldOptions({ webhookUrl: null, webhookSecret: 'whsec_test' }));
}

/** A world with one of most things, made through the world's own parts. */
function busyWorld(): ProviderWorld {
  const world = newWorld();
  world.clock.advance(90);
  world.ledger.creditAvailable(world.platformAccountId, 'usd', 12_000);
  world.ledger.creditPending(world.platformAccountId, 'usd', 3_000, world.clock.nowMs() + 60_000);
  world.idempotency.begin({
    scope: 'f|acct',
    key: 'k1',
    endpoint: 'POST /v1/transfers',
    params: { amount: '1' },
    requestId: 'req_1',
    nowMs: 5,
  });
  world.idempotency.complete('f|acct', 'k1', { status: 200, body: '{"id":"tr_a1"}' });
  world.faults.apply({ latencyMs: 20, failNext: { status: 429, count: 2 } });
  world.accounts.add({ id: 'acct_a1', object: 'account', email: 'p201@evenhand.test' } as Stripe.Account);
  world.accounts.add({ id: 'acct_a2', object: 'account', email: 'p202@evenhand.test' } as Stripe.Account);
  world.transfers.add({
    id: 'tr_a1',
    object: 'transfer',
    amount: 1_000,
    amount_reversed: 100,
    currency: 'usd',
  } as Stripe.Transfer);
  world.transferReversals.set('tr_a1', [
    { id: 'trr_a1', object: 'transfer_reversal', amount: 100 } as Stripe.TransferReversal,
  ]);
  world.payouts.add({
    id: 'po_a1',
    object: 'payout',
    amount: 500,
    created: 1_700_000_000,
    currency: 'usd',
    status: 'pending',
  } as Stripe.Payout);
  world.payoutAccounts.set('po_a1', 'acct_a1');
  world.paymentIntents.add({ id: 'pi_a1', object: 'payment_intent', status: 'succeeded' } as Stripe.PaymentIntent);
  world.emit({ type: 'transfer.created', object: { id: 'tr_a1' } });
  world.accountLinks.set('tok1', {
    token: 'tok1',
    accountId: 'acct_a2',
    type: 'account_onboarding',
    refreshUrl: 'http://127.0.0.1:5173/r',
    returnUrl: 'http://127.0.0.1:5173/d',
    createdAt: 1,
    expiresAt: 301,
    used: false,
  });
  return world;
}

function fileContent(world: ProviderWorld): WorldSnapshot {
  return JSON.parse(snapshotText(worldState(world), new Date('2026-03-01T09:30:00Z'))) as WorldSnapshot;
}

function refusal(value: unknown): SnapshotError {
  try {
    readWorldSnapshot(value);
  } catch (error) {
    if (error instanceof SnapshotError) return error;
    throw error;
  }
  throw new Error('expected the snapshot to be refused');
}

describe('readWorldSnapshot', () => {
  it('reads back what a world wrote, and a world restored from it writes the same again', () => {
    const world = busyWorld();
    const content = fileContent(world);
    expect(content).toMatchObject({
      format: 'evenhand-payments-fake-state',
      version: 1,
      savedAt: '2026-03-01T09:30:00.000Z',
    });
    const snapshot = readWorldSnapshot(content);
    expect(snapshot).toEqual(content);

    const restored = newWorld();
    restoreWorld(restored, snapshot);
    expect(restored.platformAccountId).toBe(world.platformAccountId);
    expect(JSON.stringify(worldState(restored))).toBe(JSON.stringify(worldState(world)));
    expect(restored.accounts.newestFirst().map((account) => account.id)).toEqual(['acct_a2', 'acct_a1']);
    expect(restored.clock.nowMs() - Date.now()).toBeGreaterThanOrEqual(89_000);
    expect(restored.faults.settings().failNext).toEqual({ status: 429, count: 2 });
  });

  it('names another format, another version and unknown fields', () => {
    const content = fileContent(busyWorld());
    expect(refusal([]).message).toBe('(top level): must be an object, found an array');
    expect(refusal({ ...content, format: 'something-else' }).field).toBe('format');
    expect(refusal({ ...content, version: 2 }).message).toMatch(/^version: must be 1 .*found 2$/);
    expect(refusal({ ...content, colour: 'blue' }).message).toBe('colour: is not a field of version 1');
    expect(refusal({ ...content, savedAt: 'yesterday' }).field).toBe('savedAt');
  });

  it('names the first bad field inside the content', () => {
    const content = fileContent(busyWorld());
    const broken = (change: (copy: any) => void) => {
      const copy = structuredClone(content) as any;
      change(copy);
      return refusal(copy);
    };
    expect(broken((c) => (c.ledger.pending[0].amount = 12.5)).message).toBe(
      'ledger.pending[0].amount: must be an integer, found 12.5',
    );
    expect(broken((c) => delete c.ledger.available[0].currency).message).toBe(
      'ledger.available[0].currency: must be a string, found nothing',
    );
    expect(broken((c) => (c.accounts[1].id = 'acct_a1')).message).toBe('accounts[1]: repeats acct_a1');
    expect(broken((c) => (c.payouts[0].object = 'transfer')).field).toBe('payouts[0].object');
    expect(broken((c) => (c.payoutAccounts = [])).message).toBe('payoutAccounts: has no entry for payout po_a1');
    expect(broken((c) => (c.transferReversals[0].transferId = 'tr_gone')).field).toBe(
      'transferReversals[0].transferId',
    );
    expect(broken((c) => (c.idempotency[0].response.status = 42)).field).toBe('idempotency[0].response.status');
    expect(broken((c) => (c.faults.failNext.status = 503)).field).toBe('faults.failNext.status');
    expect(broken((c) => (c.events[0].pending_webhooks = -1)).field).toBe('events[0].pending_webhooks');
    expect(broken((c) => (c.accountLinks[0].used = 'no')).field).toBe('accountLinks[0].used');
    expect(broken((c) => (c.platformAccountId = 'platform')).field).toBe('platformAccountId');
  });
});
