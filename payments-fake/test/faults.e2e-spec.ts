// Fault switches, seen through the official SDK's own retry logic (stripe 23.1.0 retries 5xx
// answers and closed connections with the same Idempotency-Key; it does not retry 429 unless
// told to). Provider behaviour referred to: https://docs.stripe.com/error-handling and
// https://docs.stripe.com/api/idempotent_requests.
import Stripe from 'stripe';
import { describe, expect, it } from 'vitest';
import { onboardedAccount, useSharedHarness, WEBHOOK_SECRET } from './support/harness';
import { caught } from './support/caught';

const standIn = useSharedHarness();

describe('request faults', () => {
  it('fails the next request with 500 api_error (StripeAPIError) and then recovers', async () => {
    await standIn.harness.control('/faults', { failNext: { status: 500, count: 1 } });
    const error = await caught(standIn.stripe.balance.retrieve());
    expect(error).toBeInstanceOf(Stripe.errors.StripeAPIError);
    expect(error.statusCode).toBe(500);
    expect(error.raw.type).toBe('api_error');
    expect((await standIn.stripe.balance.retrieve()).object).toBe('balance');
  });

  it('lets the SDK retry through a 500 without doing the work twice', async () => {
    const retrying = standIn.harness.stripe({ maxNetworkRetries: 2 });
    await standIn.harness.control('/faults', { failNext: { status: 500, count: 1 } });
    const account = await retrying.accounts.create({ type: 'express', email: 'p040@evenhand.test' });
    expect(account.object).toBe('account');
    expect((await standIn.stripe.accounts.list()).data.map((a) => a.id)).toEqual([account.id]);
  });

  it('answers 429 with rate_limit (StripeRateLimitError) for the given count', async () => {
    await standIn.harness.control('/faults', { failNext: { status: 429, count: 2 } });
    for (let i = 0; i < 2; i++) {
      const error = await caught(standIn.stripe.balance.retrieve());
      expect(error).toBeInstanceOf(Stripe.errors.StripeRateLimitError);
      expect(error.code).toBe('rate_limit');
    }
    expect((await standIn.stripe.balance.retrieve()).object).toBe('balance');
  });

  it('closes the connection before the work: the SDK retries once by itself and the call succeeds', async () => {
    await standIn.harness.control('/faults', { dropConnectionNext: 1 });
    const account = await standIn.stripe.accounts.create({ type: 'express' });
    expect((await standIn.stripe.accounts.list()).data.map((a) => a.id)).toEqual([account.id]);
  });

  it('surfaces StripeConnectionError when the connection keeps closing', async () => {
    await standIn.harness.control('/faults', { dropConnectionNext: 2 });
    const error = await caught(standIn.stripe.accounts.create({ type: 'express' }));
    expect(error).toBeInstanceOf(Stripe.errors.StripeConnectionError);
    expect((await standIn.stripe.accounts.list()).data).toHaveLength(0);
  });

  it('closes the connection after the work: the retry replays the saved transfer, money moves once', async () => {
    const destination = await onboardedAccount(standIn.harness, standIn.stripe);
    await standIn.harness.control('/balance', { amount: 5_000, currency: 'usd' });
    await standIn.harness.control('/faults', { dropResponseNext: 1 });
    const transfer = await standIn.stripe.transfers.create({
      amount: 1_200,
      currency: 'usd',
      destination: destination.id,
    });
    expect(transfer.lastResponse.headers['idempotent-replayed']).toBe('true');
    expect((await standIn.stripe.transfers.list()).data.map((t) => t.id)).toEqual([transfer.id]);
    expect((await standIn.stripe.balance.retrieve()).available).toEqual([{ amount: 3_800, currency: 'usd' }]);
  });

  it('slows answers by latencyMs', async () => {
    await standIn.harness.control('/faults', { latencyMs: 200 });
    const started = Date.now();
    await standIn.stripe.balance.retrieve();
    // A lower bound only: a busy machine can make any answer slower, never a held one faster.
    expect(Date.now() - started).toBeGreaterThanOrEqual(190);
    const cleared = await standIn.harness.control('/faults', undefined, 'DELETE');
    expect(cleared.body.latencyMs).toBe(0);
    expect(standIn.harness.fake.world.faults.latencyMs).toBe(0);
  });

  it('does not touch GET /health', async () => {
    await standIn.harness.control('/faults', { failNext: { status: 500, count: 1 } });
    const health = await fetch(`${standIn.harness.fake.url}/health`);
    expect(health.status).toBe(200);
    expect(await health.json()).toEqual({ status: 'ok' });
  });

  it('shows, merges and clears the switches, and refuses bad input naming the field', async () => {
    await standIn.harness.control('/faults', { latencyMs: 10 });
    const merged = await standIn.harness.control('/faults', { webhook: { duplicate: true } });
    expect(merged.body).toMatchObject({ latencyMs: 10, webhook: { duplicate: true, reorder: false, delayMs: 0 } });
    const bad = await standIn.harness.control('/faults', { failNext: { status: 404, count: 1 } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.param).toBe('failNext.status');
    const unknown = await standIn.harness.control('/faults', { chaos: true });
    expect(unknown.body.error.param).toBe('chaos');
    const cleared = await standIn.harness.control('/faults', undefined, 'DELETE');
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
    await standIn.harness.control('/faults', { webhook: { duplicate: true } });
    await standIn.stripe.paymentIntents.create({ amount: 900, currency: 'usd' });
    await standIn.harness.fake.world.dispatcher.idle();
    const ids = standIn.harness.receiver.received.map((hook) => hook.eventId);
    expect(ids).toHaveLength(2);
    expect(ids[0]).toBe(ids[1]);
    for (const hook of standIn.harness.receiver.received) {
      expect(standIn.stripe.webhooks.constructEvent(hook.rawBody, hook.signature, WEBHOOK_SECRET).id).toBe(ids[0]);
    }
  });

  it('delivers a burst of events last-first when reorder is on', async () => {
    await standIn.harness.control('/faults', { webhook: { reorder: true } });
    await standIn.stripe.paymentIntents.create({
      amount: 900,
      currency: 'usd',
      payment_method: 'pm_card_visa',
      confirm: true,
    });
    await standIn.harness.fake.world.dispatcher.idle();
    expect(standIn.harness.receiver.received.map((hook) => hook.type)).toEqual([
      'payment_intent.succeeded',
      'payment_intent.created',
    ]);
  });

  it('holds deliveries back by delayMs', async () => {
    await standIn.harness.control('/faults', { webhook: { delayMs: 1000 } });
    const started = Date.now();
    await standIn.stripe.paymentIntents.create({ amount: 900, currency: 'usd' });
    // Well inside the hold even when the machine is busy.
    await new Promise((resolve) => setTimeout(resolve, 100));
    expect(standIn.harness.receiver.received).toHaveLength(0);
    await standIn.harness.fake.world.dispatcher.idle();
    expect(standIn.harness.receiver.received).toHaveLength(1);
    expect(Date.now() - started).toBeGreaterThanOrEqual(990);
  });
});

describe('control routes', () => {
  it('reset forgets accounts, balances, events and idempotency keys', async () => {
    await standIn.harness.control('/balance', { amount: 100, currency: 'usd' });
    const first = await standIn.stripe.accounts.create({ type: 'express' }, { idempotencyKey: 'k-reset' });
    await standIn.harness.control('/reset');
    expect((await standIn.stripe.accounts.list()).data).toHaveLength(0);
    expect((await standIn.stripe.balance.retrieve()).available).toEqual([{ amount: 0, currency: 'usd' }]);
    const again = await standIn.stripe.accounts.create({ type: 'express' }, { idempotencyKey: 'k-reset' });
    expect(again.id).not.toBe(first.id);
  });
});
