// Fault switches, seen through the official SDK's own retry logic (stripe 23.1.0 retries 5xx
// answers and closed connections with the same Idempotency-Key; it does not retry 429 unless
// told to). Provider behaviour referred to: https://docs.stripe.com/error-handling and
// https://docs.stripe.com/api/idempotent_requests.
import Stripe from 'stripe';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { onboardedAccount, startHarness, WEBHOOK_SECRET, type Harness } from './support/harness';
import { caught } from './support/caught';

let harness: Harness;
let stripe: Stripe;

beforeAll(async () => {
  harness = await startHarness();
  stripe = harness.stripe();
});
afterAll(() => harness.close());
beforeEach(async () => {
  await harness.control('/reset');
  harness.receiver.received.length = 0;
  harness.receiver.answerWith([]);
});

describe('request faults', () => {
  it('fails the next request with 500 api_error (StripeAPIError) and then recovers', async () => {
    await harness.control('/faults', { failNext: { status: 500, count: 1 } });
    const error = await caught(stripe.balance.retrieve());
    expect(error).toBeInstanceOf(Stripe.errors.StripeAPIError);
    expect(error.statusCode).toBe(500);
    expect(error.raw.type).toBe('api_error');
    expect((await stripe.balance.retrieve()).object).toBe('balance');
  });

  it('lets the SDK retry through a 500 without doing the work twice', async () => {
    const retrying = harness.stripe({ maxNetworkRetries: 2 });
    await harness.control('/faults', { failNext: { status: 500, count: 1 } });
    const account = await retrying.accounts.create({ type: 'express', email: 'p040@evenhand.test' });
    expect(account.object).toBe('account');
    expect((await stripe.accounts.list()).data.map((a) => a.id)).toEqual([account.id]);
  });

  it('answers 429 with rate_limit (StripeRateLimitError) for the given count', async () => {
    await harness.control('/faults', { failNext: { status: 429, count: 2 } });
    for (let i = 0; i < 2; i++) {
      const error = await caught(stripe.balance.retrieve());
      expect(error).toBeInstanceOf(Stripe.errors.StripeRateLimitError);
      expect(error.code).toBe('rate_limit');
    }
    expect((await stripe.balance.retrieve()).object).toBe('balance');
  });

  it('closes the connection before the work: the SDK retries once by itself and the call succeeds', async () => {
    await harness.control('/faults', { dropConnectionNext: 1 });
    const account = await stripe.accounts.create({ type: 'express' });
    expect((await stripe.accounts.list()).data.map((a) => a.id)).toEqual([account.id]);
  });

  it('surfaces StripeConnectionError when the connection keeps closing', async () => {
    await harness.control('/faults', { dropConnectionNext: 2 });
    const error = await caught(stripe.accounts.create({ type: 'express' }));
    expect(error).toBeInstanceOf(Stripe.errors.StripeConnectionError);
    expect((await stripe.accounts.list()).data).toHaveLength(0);
  });

  it('closes the connection after the work: the retry replays the saved transfer, money moves once', async () => {
    const destination = await onboardedAccount(harness, stripe);
    await harness.control('/balance', { amount: 5_000, currency: 'usd' });
    await harness.control('/faults', { dropResponseNext: 1 });
    const transfer = await stripe.transfers.create({ amount: 1_200, currency: 'usd', destination: destination.id });
    expect(transfer.lastResponse.headers['idempotent-replayed']).toBe('true');
    expect((await stripe.transfers.list()).data.map((t) => t.id)).toEqual([transfer.id]);
    expect((await stripe.balance.retrieve()).available).toEqual([{ amount: 3_800, currency: 'usd' }]);
  });

  it('slows answers by latencyMs', async () => {
    await harness.control('/faults', { latencyMs: 200 });
    const started = Date.now();
    await stripe.balance.retrieve();
    // A lower bound only: a busy machine can make any answer slower, never a held one faster.
    expect(Date.now() - started).toBeGreaterThanOrEqual(190);
    const cleared = await harness.control('/faults', undefined, 'DELETE');
    expect(cleared.body.latencyMs).toBe(0);
    expect(harness.fake.world.faults.latencyMs).toBe(0);
  });

  it('does not touch GET /health', async () => {
    await harness.control('/faults', { failNext: { status: 500, count: 1 } });
    const health = await fetch(`${harness.fake.url}/health`);
    expect(health.status).toBe(200);
    expect(await health.json()).toEqual({ status: 'ok' });
  });

  it('shows, merges and clears the switches, and refuses bad input naming the field', async () => {
    await harness.control('/faults', { latencyMs: 10 });
    const merged = await harness.control('/faults', { webhook: { duplicate: true } });
    expect(merged.body).toMatchObject({ latencyMs: 10, webhook: { duplicate: true, reorder: false, delayMs: 0 } });
    const bad = await harness.control('/faults', { failNext: { status: 404, count: 1 } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.param).toBe('failNext.status');
    const unknown = await harness.control('/faults', { chaos: true });
    expect(unknown.body.error.param).toBe('chaos');
    const cleared = await harness.control('/faults', undefined, 'DELETE');
    expect(cleared.body).toMatchObject({
      latencyMs: 0,
      failNext: null,
      dropConnectionNext: 0,
      webhook: { duplicate: false },
    });
  });
});

describe('webhook faults', () => {
  it('delivers every event twice when duplicate is on, both copies verifiable', async () => {
    await harness.control('/faults', { webhook: { duplicate: true } });
    await stripe.paymentIntents.create({ amount: 900, currency: 'usd' });
    await harness.fake.world.dispatcher.idle();
    const ids = harness.receiver.received.map((hook) => hook.eventId);
    expect(ids).toHaveLength(2);
    expect(ids[0]).toBe(ids[1]);
    for (const hook of harness.receiver.received) {
      expect(stripe.webhooks.constructEvent(hook.rawBody, hook.signature, WEBHOOK_SECRET).id).toBe(ids[0]);
    }
  });

  it('delivers a burst of events last-first when reorder is on', async () => {
    await harness.control('/faults', { webhook: { reorder: true } });
    await stripe.paymentIntents.create({ amount: 900, currency: 'usd', payment_method: 'pm_card_visa', confirm: true });
    await harness.fake.world.dispatcher.idle();
    expect(harness.receiver.received.map((hook) => hook.type)).toEqual([
      'payment_intent.succeeded',
      'payment_intent.created',
    ]);
  });

  it('holds deliveries back by delayMs', async () => {
    await harness.control('/faults', { webhook: { delayMs: 1000 } });
    const started = Date.now();
    await stripe.paymentIntents.create({ amount: 900, currency: 'usd' });
    // Well inside the hold even when the machine is busy.
    await new Promise((resolve) => setTimeout(resolve, 100));
    expect(harness.receiver.received).toHaveLength(0);
    await harness.fake.world.dispatcher.idle();
    expect(harness.receiver.received).toHaveLength(1);
    expect(Date.now() - started).toBeGreaterThanOrEqual(990);
  });
});

describe('control routes', () => {
  it('reset forgets accounts, balances, events and idempotency keys', async () => {
    await harness.control('/balance', { amount: 100, currency: 'usd' });
    const first = await stripe.accounts.create({ type: 'express' }, { idempotencyKey: 'k-reset' });
    await harness.control('/reset');
    expect((await stripe.accounts.list()).data).toHaveLength(0);
    expect((await stripe.balance.retrieve()).available).toEqual([{ amount: 0, currency: 'usd' }]);
    const again = await stripe.accounts.create({ type: 'express' }, { idempotencyKey: 'k-reset' });
    expect(again.id).not.toBe(first.id);
  });
});
