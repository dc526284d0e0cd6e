// Idempotent requests through the official SDK. Behaviour checked against
// https://docs.stripe.com/api/idempotent_requests: the first result (success or error) is saved
// and replayed for the same key and parameters; other parameters or another endpoint with the
// same key are an idempotency_error; parameter-validation failures are not saved; a key whose
// first request is still running is refused (409).
import Stripe from 'stripe';
import { describe, expect, it } from 'vitest';
import { onboardedAccount, useSharedHarness, waitFor } from './support/harness';
import { caught } from './support/caught';

const standIn = useSharedHarness();

describe('idempotency keys', () => {
  it('replays the first response for the same key and parameters, marked Idempotent-Replayed', async () => {
    const params: Stripe.AccountCreateParams = {
      type: 'express',
      email: 'p010@evenhand.test',
      metadata: { participant: 'p010' },
    };
    const first = await standIn.stripe.accounts.create(params, { idempotencyKey: 'onboard-p010' });
    const second = await standIn.stripe.accounts.create(params, { idempotencyKey: 'onboard-p010' });
    expect(second.id).toBe(first.id);
    expect(second.lastResponse.headers['idempotent-replayed']).toBe('true');
    expect(second.lastResponse.headers['original-request']).toBe(first.lastResponse.requestId);
    expect(second.lastResponse.headers['idempotency-key']).toBe('onboard-p010');
    expect(first.lastResponse.headers['idempotent-replayed']).toBeUndefined();
    const all = await standIn.stripe.accounts.list();
    expect(all.data).toHaveLength(1);
  });

  it('treats parameters sent in another order as the same request', async () => {
    const first = await standIn.stripe.accounts.create(
      { type: 'express', email: 'p011@evenhand.test' },
      { idempotencyKey: 'k-order' },
    );
    const second = await standIn.stripe.accounts.create(
      { email: 'p011@evenhand.test', type: 'express' },
      { idempotencyKey: 'k-order' },
    );
    expect(second.id).toBe(first.id);
  });

  it('refuses the same key with other parameters with 400 idempotency_error', async () => {
    await standIn.stripe.accounts.create(
      { type: 'express', email: 'p012@evenhand.test' },
      { idempotencyKey: 'k-mismatch' },
    );
    const error = await caught(
      standIn.stripe.accounts.create(
        { type: 'express', email: 'p013@evenhand.test' },
        { idempotencyKey: 'k-mismatch' },
      ),
    );
    expect(error).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    expect(error.statusCode).toBe(400);
    expect(error.raw.type).toBe('idempotency_error');
    expect(error.message).toContain('k-mismatch');
  });

  it('refuses the same key on another endpoint', async () => {
    const account = await standIn.stripe.accounts.create({ type: 'express' }, { idempotencyKey: 'k-endpoint' });
    const error = await caught(standIn.stripe.accounts.update(account.id, {}, { idempotencyKey: 'k-endpoint' }));
    expect(error).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    expect(error.message).toContain('/v1/accounts');
  });

  it('replays a saved error even after the cause has gone away', async () => {
    const destination = await onboardedAccount(standIn.harness, standIn.stripe);
    const params: Stripe.TransferCreateParams = { amount: 1500, currency: 'usd', destination: destination.id };
    const first = await caught(standIn.stripe.transfers.create(params, { idempotencyKey: 'payout-42' }));
    expect(first.code).toBe('balance_insufficient');

    await standIn.harness.control('/balance', { amount: 10_000, currency: 'usd' });
    const replayed = await caught(standIn.stripe.transfers.create(params, { idempotencyKey: 'payout-42' }));
    expect(replayed.code).toBe('balance_insufficient');
    expect(replayed.headers['idempotent-replayed']).toBe('true');

    const fresh = await standIn.stripe.transfers.create(params, { idempotencyKey: 'payout-42-retry' });
    expect(fresh.amount).toBe(1500);
  });

  it('does not keep a parameter-validation failure, so a corrected retry with the same key runs', async () => {
    const bad = await caught(
      standIn.stripe.accounts.create({ email: 'p014@evenhand.test' } as never, { idempotencyKey: 'k-fix' }),
    );
    expect(bad.code).toBe('parameter_missing');
    // The corrected request has other parameters, but nothing was saved under the key.
    const good = await standIn.stripe.accounts.create(
      { type: 'express', email: 'p014@evenhand.test' },
      { idempotencyKey: 'k-fix' },
    );
    expect(good.object).toBe('account');
  });

  it('scopes keys to the account the request acts for', async () => {
    const destination = await onboardedAccount(standIn.harness, standIn.stripe);
    await standIn.harness.control('/balance', { amount: 5000, currency: 'usd' });
    await standIn.harness.control('/balance', { amount: 5000, currency: 'usd', account: destination.id });
    const platformPayout = await standIn.stripe.payouts.create(
      { amount: 100, currency: 'usd' },
      { idempotencyKey: 'k-scope' },
    );
    const connectedPayout = await standIn.stripe.payouts.create(
      { amount: 100, currency: 'usd' },
      { idempotencyKey: 'k-scope', stripeAccount: destination.id },
    );
    expect(connectedPayout.id).not.toBe(platformPayout.id);
  });

  it('refuses a second request with a key whose first request is still running (409)', async () => {
    await standIn.harness.control('/faults', { latencyMs: 1000 });
    const params: Stripe.AccountCreateParams = { type: 'express', email: 'p015@evenhand.test' };
    // The second is sent once the stand-in holds the first as running, not after a fixed pause.
    const [first, second] = await Promise.allSettled([
      standIn.stripe.accounts.create(params, { idempotencyKey: 'k-concurrent' }),
      waitFor(
        () => standIn.harness.fake.world.idempotency.runningKeys().includes('k-concurrent'),
        10_000,
        'the first request',
      ).then(() => standIn.stripe.accounts.create(params, { idempotencyKey: 'k-concurrent' })),
    ]);
    expect(first.status).toBe('fulfilled');
    expect(second.status).toBe('rejected');
    const error = (second as PromiseRejectedResult).reason;
    expect(error.statusCode).toBe(409);
    expect(error.code).toBe('idempotency_key_in_use');
    await standIn.harness.control('/faults', undefined, 'DELETE');
    // Once the first has finished, the same key replays it.
    const later = await standIn.stripe.accounts.create(params, { idempotencyKey: 'k-concurrent' });
    expect(later.id).toBe((first as PromiseFulfilledResult<Stripe.Account>).value.id);
  });

  it('refuses a key longer than 255 characters', async () => {
    const error = await caught(
      standIn.stripe.accounts.create({ type: 'express' }, { idempotencyKey: 'k'.repeat(256) }),
    );
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
  });
});
