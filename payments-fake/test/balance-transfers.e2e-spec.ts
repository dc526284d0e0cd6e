// Balance, transfers and reversals through the official SDK. Shapes checked against:
//   balance object           https://docs.stripe.com/api/balance/balance_object
//   transfer object          https://docs.stripe.com/api/transfers/object
//   transfer reversal object https://docs.stripe.com/api/transfer_reversals/object
//   error codes              https://docs.stripe.com/error-codes (balance_insufficient,
//                            insufficient_capabilities_for_transfer, resource_missing)
import Stripe from 'stripe';
import { describe, expect, it } from 'vitest';
import { onboardedAccount, useSharedHarness } from './support/harness';
import { caught } from './support/caught';

const standIn = useSharedHarness();

describe('balance', () => {
  it('starts at zero for the platform', async () => {
    const balance = await standIn.stripe.balance.retrieve();
    expect(balance).toMatchObject({
      object: 'balance',
      livemode: false,
      available: [{ amount: 0, currency: 'usd' }],
      pending: [{ amount: 0, currency: 'usd' }],
    });
  });

  it('shows the amount set through the control route', async () => {
    const control = await standIn.harness.control('/balance', { amount: 25_000, currency: 'USD' });
    expect(control.status).toBe(200);
    const balance = await standIn.stripe.balance.retrieve();
    expect(balance.available).toEqual([{ amount: 25_000, currency: 'usd' }]);
  });

  it('refuses a bad control body naming the field', async () => {
    const response = await standIn.harness.control('/balance', { amount: 12.5, currency: 'usd' });
    expect(response.status).toBe(400);
    expect(response.body.error.param).toBe('amount');
    const currency = await standIn.harness.control('/balance', { amount: 100, currency: 'dollars' });
    expect(currency.body.error.param).toBe('currency');
  });
});

describe('transfers', () => {
  it('moves money from the platform balance to the connected account', async () => {
    const destination = await onboardedAccount(standIn.harness, standIn.stripe);
    await standIn.harness.control('/balance', { amount: 10_000, currency: 'usd' });
    const transfer = await standIn.stripe.transfers.create({
      amount: 2_500,
      currency: 'usd',
      destination: destination.id,
      transfer_group: 'study-wayfinding-session-1',
      metadata: { payout: 'payout-7' },
    });
    expect(transfer).toMatchObject({
      object: 'transfer',
      amount: 2_500,
      amount_reversed: 0,
      currency: 'usd',
      destination: destination.id,
      transfer_group: 'study-wayfinding-session-1',
      metadata: { payout: 'payout-7' },
      reversed: false,
      livemode: false,
      reversals: { object: 'list', data: [], has_more: false, url: `/v1/transfers/${transfer.id}/reversals` },
    });
    expect(transfer.id).toMatch(/^tr_/);
    expect((await standIn.stripe.balance.retrieve()).available).toEqual([{ amount: 7_500, currency: 'usd' }]);
    const connected = await standIn.stripe.balance.retrieve({}, { stripeAccount: destination.id });
    expect(connected.available).toEqual([{ amount: 2_500, currency: 'usd' }]);

    const fetched = await standIn.stripe.transfers.retrieve(transfer.id, { expand: ['destination'] });
    expect((fetched.destination as Stripe.Account).id).toBe(destination.id);
    expect((fetched.destination as Stripe.Account).object).toBe('account');
  });

  it('fails with balance_insufficient when the platform balance is short, and changes nothing', async () => {
    const destination = await onboardedAccount(standIn.harness, standIn.stripe);
    await standIn.harness.control('/balance', { amount: 999, currency: 'usd' });
    const error = await caught(
      standIn.stripe.transfers.create({ amount: 1_000, currency: 'usd', destination: destination.id }),
    );
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(error.statusCode).toBe(400);
    expect(error.code).toBe('balance_insufficient');
    expect((await standIn.stripe.balance.retrieve()).available).toEqual([{ amount: 999, currency: 'usd' }]);
    expect((await standIn.stripe.transfers.list()).data).toHaveLength(0);
  });

  it('refuses a destination that has not finished onboarding', async () => {
    await standIn.harness.control('/balance', { amount: 10_000, currency: 'usd' });
    const fresh = await standIn.stripe.accounts.create({
      type: 'express',
      capabilities: { transfers: { requested: true } },
    });
    const error = await caught(
      standIn.stripe.transfers.create({ amount: 100, currency: 'usd', destination: fresh.id }),
    );
    expect(error.code).toBe('insufficient_capabilities_for_transfer');
    expect(error.param).toBe('destination');
  });

  it('refuses an unknown destination with resource_missing', async () => {
    await standIn.harness.control('/balance', { amount: 10_000, currency: 'usd' });
    const error = await caught(
      standIn.stripe.transfers.create({ amount: 100, currency: 'usd', destination: 'acct_1234567890abcdef' }),
    );
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(error.code).toBe('resource_missing');
    expect(error.param).toBe('destination');
  });

  it('refuses a non-integer amount naming it', async () => {
    const error = await caught(
      standIn.stripe.transfers.create({ amount: 10.5, currency: 'usd', destination: 'acct_x' }),
    );
    expect(error.code).toBe('parameter_invalid_integer');
    expect(error.param).toBe('amount');
  });

  it('answers an unknown transfer with 404 resource_missing', async () => {
    const error = await caught(standIn.stripe.transfers.retrieve('tr_doesnotexist'));
    expect(error.statusCode).toBe(404);
    expect(error.code).toBe('resource_missing');
    expect(error.param).toBe('id');
  });

  it('lists newest first, filters by destination, and pages', async () => {
    const first = await onboardedAccount(standIn.harness, standIn.stripe);
    const second = await onboardedAccount(standIn.harness, standIn.stripe);
    await standIn.harness.control('/balance', { amount: 100_000, currency: 'usd' });
    const made: string[] = [];
    for (const [destination, amount] of [
      [first.id, 100],
      [second.id, 200],
      [first.id, 300],
      [first.id, 400],
    ] as const) {
      made.push((await standIn.stripe.transfers.create({ amount, currency: 'usd', destination })).id);
    }
    const toFirst = await standIn.stripe.transfers.list({ destination: first.id, limit: 2 });
    expect(toFirst.data.map((t) => t.amount)).toEqual([400, 300]);
    expect(toFirst.has_more).toBe(true);
    const rest = await standIn.stripe.transfers.list({
      destination: first.id,
      limit: 2,
      starting_after: toFirst.data[1]?.id,
    });
    expect(rest.data.map((t) => t.amount)).toEqual([100]);
    expect(rest.has_more).toBe(false);
    const all = await standIn.stripe.transfers.list({ limit: 3 }).autoPagingToArray({ limit: 100 });
    expect(all.map((t) => t.id)).toEqual([...made].reverse());
    const expanded = await standIn.stripe.transfers.list({ limit: 1, expand: ['data.destination'] });
    expect((expanded.data[0]?.destination as Stripe.Account).object).toBe('account');
  });

  it('refuses a limit outside 1..100', async () => {
    const error = await caught(standIn.stripe.transfers.list({ limit: 101 }));
    expect(error.param).toBe('limit');
  });

  it('reverses part and then the rest, returning the money to the platform', async () => {
    const destination = await onboardedAccount(standIn.harness, standIn.stripe);
    await standIn.harness.control('/balance', { amount: 5_000, currency: 'usd' });
    const transfer = await standIn.stripe.transfers.create({
      amount: 3_000,
      currency: 'usd',
      destination: destination.id,
    });

    const partial = await standIn.stripe.transfers.createReversal(transfer.id, {
      amount: 1_000,
      metadata: { reason: 'overpaid' },
    });
    expect(partial).toMatchObject({
      object: 'transfer_reversal',
      amount: 1_000,
      currency: 'usd',
      transfer: transfer.id,
    });
    expect(partial.id).toMatch(/^trr_/);
    let after = await standIn.stripe.transfers.retrieve(transfer.id);
    expect(after.amount_reversed).toBe(1_000);
    expect(after.reversed).toBe(false);
    expect(after.reversals.data.map((r) => r.id)).toEqual([partial.id]);

    const tooMuch = await caught(standIn.stripe.transfers.createReversal(transfer.id, { amount: 2_001 }));
    expect(tooMuch.param).toBe('amount');

    const rest = await standIn.stripe.transfers.createReversal(transfer.id);
    expect(rest.amount).toBe(2_000);
    after = await standIn.stripe.transfers.retrieve(transfer.id);
    expect(after.reversed).toBe(true);
    expect(after.amount_reversed).toBe(3_000);
    expect((await standIn.stripe.balance.retrieve()).available).toEqual([{ amount: 5_000, currency: 'usd' }]);
    expect((await standIn.stripe.balance.retrieve({}, { stripeAccount: destination.id })).available).toEqual([
      { amount: 0, currency: 'usd' },
    ]);

    const reversals = await standIn.stripe.transfers.listReversals(transfer.id);
    expect(reversals.data.map((r) => r.id)).toEqual([rest.id, partial.id]);
    const one = await standIn.stripe.transfers.retrieveReversal(transfer.id, partial.id);
    expect(one.metadata).toEqual({ reason: 'overpaid' });

    const events = await standIn.stripe.events.list({ type: 'transfer.*' });
    expect(events.data.map((e) => e.type)).toEqual(['transfer.reversed', 'transfer.reversed', 'transfer.created']);
  });

  it('updates a transfer description and metadata with transfer.updated', async () => {
    const destination = await onboardedAccount(standIn.harness, standIn.stripe);
    await standIn.harness.control('/balance', { amount: 500, currency: 'usd' });
    const transfer = await standIn.stripe.transfers.create({
      amount: 500,
      currency: 'usd',
      destination: destination.id,
    });
    const updated = await standIn.stripe.transfers.update(transfer.id, {
      description: 'Session 1 pay',
      metadata: { batch: '3' },
    });
    expect(updated.description).toBe('Session 1 pay');
    expect(updated.metadata).toEqual({ batch: '3' });
    const events = await standIn.stripe.events.list({ type: 'transfer.updated' });
    expect(events.data[0]?.data.previous_attributes).toEqual({ description: null, metadata: {} });
  });
});
