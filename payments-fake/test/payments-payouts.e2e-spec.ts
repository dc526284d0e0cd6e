// Top-ups by payment intent and payouts, through the official SDK. Checked against:
//   payment intent object and statuses https://docs.stripe.com/api/payment_intents/object
//   test payment methods               https://docs.stripe.com/testing (pm_card_visa, pm_card_bypassPending,
//                                      pm_card_chargeDeclined, pm_card_chargeDeclinedInsufficientFunds)
//   card errors, decline codes         https://docs.stripe.com/api/errors, https://docs.stripe.com/declines/codes
//   payout object                      https://docs.stripe.com/api/payouts/object
import Stripe from 'stripe';
import { describe, expect, it } from 'vitest';
import { onboardedAccount, startHarness, useSharedHarness, waitFor } from './support/harness';
import { caught } from './support/caught';

const standIn = useSharedHarness();

describe('payment intents (top-ups)', () => {
  it('goes requires_payment_method → succeeded with pm_card_visa and credits the platform', async () => {
    const intent = await standIn.stripe.paymentIntents.create({
      amount: 50_000,
      currency: 'usd',
      allowed_payment_method_types: ['card'],
      description: 'Fund study: Wayfinding cues',
      metadata: { study: 'wayfinding-cues' },
    });
    expect(intent.id).toMatch(/^pi_/);
    expect(intent.status).toBe('requires_payment_method');
    expect(intent.client_secret).toMatch(new RegExp(`^${intent.id}_secret_`));
    expect(intent.amount_received).toBe(0);
    expect(intent.allowed_payment_method_types).toEqual(['card']);
    expect(intent.payment_method_types).toEqual(['card']);

    const confirmed = await standIn.stripe.paymentIntents.confirm(intent.id, { payment_method: 'pm_card_visa' });
    expect(confirmed.status).toBe('succeeded');
    expect(confirmed.amount_received).toBe(50_000);
    expect(confirmed.payment_method).toMatch(/^pm_/);
    expect(confirmed.latest_charge).toMatch(/^ch_/);
    expect((await standIn.stripe.balance.retrieve()).available).toEqual([{ amount: 50_000, currency: 'usd' }]);

    const events = await standIn.stripe.events.list({ type: 'payment_intent.*' });
    expect(events.data.map((e) => e.type)).toEqual(['payment_intent.succeeded', 'payment_intent.created']);
    expect(events.data[0]?.request?.id).toBe(confirmed.lastResponse.requestId);
  });

  it('creates and confirms in one call', async () => {
    const intent = await standIn.stripe.paymentIntents.create({
      amount: 1_000,
      currency: 'usd',
      payment_method: 'pm_card_mastercard',
      confirm: true,
    });
    expect(intent.status).toBe('succeeded');
  });

  it('declines pm_card_chargeDeclinedInsufficientFunds with a 402 card_error and keeps the intent retryable', async () => {
    const intent = await standIn.stripe.paymentIntents.create({ amount: 2_000, currency: 'usd' });
    const error = await caught(
      standIn.stripe.paymentIntents.confirm(intent.id, { payment_method: 'pm_card_chargeDeclinedInsufficientFunds' }),
    );
    expect(error).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect(error.statusCode).toBe(402);
    expect(error.code).toBe('card_declined');
    expect(error.decline_code).toBe('insufficient_funds');
    expect(error.payment_intent.id).toBe(intent.id);
    expect(error.payment_intent.status).toBe('requires_payment_method');

    const after = await standIn.stripe.paymentIntents.retrieve(intent.id);
    expect(after.last_payment_error?.decline_code).toBe('insufficient_funds');
    expect((await standIn.stripe.balance.retrieve()).available).toEqual([{ amount: 0, currency: 'usd' }]);

    const retried = await standIn.stripe.paymentIntents.confirm(intent.id, { payment_method: 'pm_card_visa' });
    expect(retried.status).toBe('succeeded');
    expect(retried.last_payment_error).toBeNull();
  });

  it('refuses an amount below the currency minimum and an unknown payment method', async () => {
    const small = await caught(standIn.stripe.paymentIntents.create({ amount: 49, currency: 'usd' }));
    expect(small.code).toBe('amount_too_small');
    expect(small.param).toBe('amount');
    const intent = await standIn.stripe.paymentIntents.create({ amount: 500, currency: 'usd' });
    const unknown = await caught(
      standIn.stripe.paymentIntents.confirm(intent.id, { payment_method: 'pm_card_imaginary' }),
    );
    expect(unknown.code).toBe('resource_missing');
    expect(unknown.param).toBe('payment_method');
  });

  it('cancels an unconfirmed intent and refuses to confirm it afterwards', async () => {
    const intent = await standIn.stripe.paymentIntents.create({ amount: 500, currency: 'usd' });
    const canceled = await standIn.stripe.paymentIntents.cancel(intent.id, { cancellation_reason: 'abandoned' });
    expect(canceled.status).toBe('canceled');
    expect(canceled.cancellation_reason).toBe('abandoned');
    const error = await caught(standIn.stripe.paymentIntents.confirm(intent.id, { payment_method: 'pm_card_visa' }));
    expect(error.code).toBe('payment_intent_unexpected_state');
  });

  it('holds card funds as pending when a pending period is configured, then makes them available', async () => {
    const pendingHarness = await startHarness({ fundsPendingMs: 60_000, webhookUrl: null });
    try {
      const client = pendingHarness.stripe();
      await client.paymentIntents.create({
        amount: 3_000,
        currency: 'usd',
        payment_method: 'pm_card_visa',
        confirm: true,
      });
      let balance = await client.balance.retrieve();
      expect(balance.available).toEqual([{ amount: 0, currency: 'usd' }]);
      expect(balance.pending).toEqual([{ amount: 3_000, currency: 'usd' }]);

      // pm_card_bypassPending goes straight to available, as the provider's test card 4000000000000077 does.
      await client.paymentIntents.create({
        amount: 700,
        currency: 'usd',
        payment_method: 'pm_card_bypassPending',
        confirm: true,
      });
      balance = await client.balance.retrieve();
      expect(balance.available).toEqual([{ amount: 700, currency: 'usd' }]);

      await pendingHarness.control('/clock', { advanceSeconds: 61 });
      balance = await client.balance.retrieve();
      expect(balance.available).toEqual([{ amount: 3_700, currency: 'usd' }]);
      expect(balance.pending).toEqual([{ amount: 0, currency: 'usd' }]);
      expect((await client.events.list({ type: 'balance.available' })).data).toHaveLength(1);
    } finally {
      await pendingHarness.close();
    }
  });
});

describe('payouts', () => {
  it('pays out from the platform balance: pending, then paid when settled', async () => {
    await standIn.harness.control('/balance', { amount: 10_000, currency: 'usd' });
    const payout = await standIn.stripe.payouts.create({ amount: 4_000, currency: 'usd', metadata: { batch: '1' } });
    expect(payout).toMatchObject({
      object: 'payout',
      amount: 4_000,
      currency: 'usd',
      status: 'pending',
      method: 'standard',
    });
    expect(payout.id).toMatch(/^po_/);
    expect(payout.arrival_date).toBeGreaterThan(payout.created);
    expect((await standIn.stripe.balance.retrieve()).available).toEqual([{ amount: 6_000, currency: 'usd' }]);

    const settled = await standIn.harness.control('/settle');
    expect(settled.body.payoutsPaid).toEqual([payout.id]);
    expect((await standIn.stripe.payouts.retrieve(payout.id)).status).toBe('paid');
    const events = await standIn.stripe.events.list({ type: 'payout.*' });
    expect(events.data.map((e) => e.type)).toEqual(['payout.paid', 'payout.created']);
  });

  it('settles on its own after the configured time', async () => {
    const quick = await startHarness({ payoutSettleMs: 50, webhookUrl: null });
    try {
      const client = quick.stripe();
      await quick.control('/balance', { amount: 1_000, currency: 'usd' });
      const payout = await client.payouts.create({ amount: 1_000, currency: 'usd' });
      await waitFor(() => quick.fake.world.payouts.get(payout.id)?.status === 'paid', 10_000, 'payout paid');
      expect((await client.payouts.retrieve(payout.id)).status).toBe('paid');
    } finally {
      await quick.close();
    }
  });

  it('refuses a payout larger than the balance with balance_insufficient', async () => {
    await standIn.harness.control('/balance', { amount: 100, currency: 'usd' });
    const error = await caught(standIn.stripe.payouts.create({ amount: 101, currency: 'usd' }));
    expect(error.code).toBe('balance_insufficient');
  });

  it('pays out a connected account only once it is onboarded, from its own balance', async () => {
    const fresh = await standIn.stripe.accounts.create({ type: 'express' });
    const notYet = await caught(
      standIn.stripe.payouts.create({ amount: 100, currency: 'usd' }, { stripeAccount: fresh.id }),
    );
    expect(notYet.code).toBe('payouts_not_allowed');

    const participant = await onboardedAccount(standIn.harness, standIn.stripe);
    await standIn.harness.control('/balance', { amount: 2_000, currency: 'usd' });
    await standIn.stripe.transfers.create({ amount: 2_000, currency: 'usd', destination: participant.id });
    const payout = await standIn.stripe.payouts.create(
      { amount: 1_500, currency: 'usd' },
      { stripeAccount: participant.id },
    );
    expect(payout.destination).toBe(participant.external_accounts?.data[0]?.id);
    expect((await standIn.stripe.balance.retrieve({}, { stripeAccount: participant.id })).available).toEqual([
      { amount: 500, currency: 'usd' },
    ]);
    // The platform does not see the connected account's payouts, and vice versa.
    expect((await standIn.stripe.payouts.list()).data).toHaveLength(0);
    expect((await standIn.stripe.payouts.list({}, { stripeAccount: participant.id })).data.map((p) => p.id)).toEqual([
      payout.id,
    ]);
    const error = await caught(standIn.stripe.payouts.retrieve(payout.id));
    expect(error.code).toBe('resource_missing');
  });

  it('cancels a pending payout and returns the money', async () => {
    await standIn.harness.control('/balance', { amount: 1_000, currency: 'usd' });
    const payout = await standIn.stripe.payouts.create({ amount: 600, currency: 'usd' });
    const canceled = await standIn.stripe.payouts.cancel(payout.id);
    expect(canceled.status).toBe('canceled');
    expect((await standIn.stripe.balance.retrieve()).available).toEqual([{ amount: 1_000, currency: 'usd' }]);
    const again = await caught(standIn.stripe.payouts.cancel(payout.id));
    expect(again.code).toBe('payout_not_cancelable');
  });

  it('fails a payout through the control route, returning the money, and lists by status', async () => {
    await standIn.harness.control('/balance', { amount: 1_000, currency: 'usd' });
    const payout = await standIn.stripe.payouts.create({ amount: 400, currency: 'usd' });
    const other = await standIn.stripe.payouts.create({ amount: 100, currency: 'usd' });
    const failed = await standIn.harness.control(`/payouts/${payout.id}/fail`, { failureCode: 'account_closed' });
    expect(failed.status).toBe(200);
    const fetched = await standIn.stripe.payouts.retrieve(payout.id);
    expect(fetched.status).toBe('failed');
    expect(fetched.failure_code).toBe('account_closed');
    expect((await standIn.stripe.balance.retrieve()).available).toEqual([{ amount: 900, currency: 'usd' }]);
    expect((await standIn.stripe.payouts.list({ status: 'pending' })).data.map((p) => p.id)).toEqual([other.id]);
    expect((await standIn.stripe.events.list({ type: 'payout.failed' })).data).toHaveLength(1);
  });
});
