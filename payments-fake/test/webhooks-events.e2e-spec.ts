// Events and signed webhook deliveries. Checked against:
//   event object            https://docs.stripe.com/api/events/object
//   list / retrieve events  https://docs.stripe.com/api/events/list, /retrieve
//   signatures              https://docs.stripe.com/webhooks#verify-manually — and, as the outside
//                           reference, the official SDK's stripe.webhooks.constructEvent
//   retries                 https://docs.stripe.com/webhooks#retries (non-2xx answers are retried)
import Stripe from 'stripe';
import { describe, expect, it } from 'vitest';
import { useSharedHarness, WEBHOOK_SECRET } from './support/harness';

const standIn = useSharedHarness();

async function topUp(amount: number): Promise<Stripe.PaymentIntent> {
  return standIn.stripe.paymentIntents.create({
    amount,
    currency: 'usd',
    payment_method: 'pm_card_visa',
    confirm: true,
  });
}

describe('webhook delivery', () => {
  it('signs each delivery so that the SDK constructEvent accepts it', async () => {
    const intent = await topUp(1_000);
    await standIn.harness.fake.world.dispatcher.idle();
    expect(standIn.harness.receiver.received.map((hook) => hook.type)).toEqual([
      'payment_intent.created',
      'payment_intent.succeeded',
    ]);
    for (const hook of standIn.harness.receiver.received) {
      expect(hook.signature).toMatch(/^t=\d+,v1=[0-9a-f]{64}$/);
      expect(hook.headers['content-type']).toMatch(/^application\/json/);
      const event = standIn.stripe.webhooks.constructEvent(hook.rawBody, hook.signature, WEBHOOK_SECRET);
      expect(event.id).toBe(hook.eventId);
      expect(event.object).toBe('event');
      expect(event.livemode).toBe(false);
      expect((event.data.object as Stripe.PaymentIntent).id).toBe(intent.id);
    }
  });

  it('fails verification for a changed body or the wrong secret', async () => {
    await topUp(1_000);
    await standIn.harness.fake.world.dispatcher.idle();
    const hook = standIn.harness.receiver.received[0]!;
    expect(() =>
      standIn.stripe.webhooks.constructEvent(hook.rawBody.replace('1000', '9000'), hook.signature, WEBHOOK_SECRET),
    ).toThrow(Stripe.errors.StripeSignatureVerificationError);
    expect(() => standIn.stripe.webhooks.constructEvent(hook.rawBody, hook.signature, 'whsec_someone_else')).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    );
  });

  it('retries a delivery the endpoint did not accept, then counts it as received', async () => {
    standIn.harness.receiver.answerWith([500, 503]);
    const account = await standIn.stripe.accounts.create({ type: 'express' });
    await standIn.stripe.accounts.update(account.id, { metadata: { participant: 'p030' } });
    await standIn.harness.fake.world.dispatcher.idle();
    const deliveries = (await standIn.harness.control('/webhooks/deliveries', undefined, 'GET')).body.deliveries;
    expect(deliveries.map((d: { status: number; attempt: number }) => [d.attempt, d.status])).toEqual([
      [1, 500],
      [2, 503],
      [3, 200],
    ]);
    const eventId = standIn.harness.receiver.received[0]!.eventId;
    expect(standIn.harness.receiver.received.every((hook) => hook.eventId === eventId)).toBe(true);
    const event = await standIn.stripe.events.retrieve(eventId, {}, { stripeAccount: account.id });
    expect(event.pending_webhooks).toBe(0);
  });

  it('gives up after the configured retries', async () => {
    standIn.harness.receiver.answerWith([500, 500, 500, 500]);
    await topUp(800);
    await standIn.harness.fake.world.dispatcher.idle();
    const deliveries = (await standIn.harness.control('/webhooks/deliveries', undefined, 'GET')).body.deliveries;
    const created = deliveries.filter((d: { type: string }) => d.type === 'payment_intent.created');
    expect(created.map((d: { attempt: number }) => d.attempt)).toEqual([1, 2, 3]);
  });
});

describe('events API', () => {
  it('lists events newest first, filters by type and wildcard, and retrieves one', async () => {
    await topUp(1_000);
    const intent = await standIn.stripe.paymentIntents.create({ amount: 600, currency: 'usd' });
    await standIn.stripe.paymentIntents.cancel(intent.id);

    const all = await standIn.stripe.events.list();
    expect(all.object).toBe('list');
    expect(all.url).toBe('/v1/events');
    expect(all.data.map((e) => e.type)).toEqual([
      'payment_intent.canceled',
      'payment_intent.created',
      'payment_intent.succeeded',
      'payment_intent.created',
    ]);
    const created = await standIn.stripe.events.list({ type: 'payment_intent.created' });
    expect(created.data).toHaveLength(2);
    const several = await standIn.stripe.events.list({
      types: ['payment_intent.canceled', 'payment_intent.succeeded'],
    });
    expect(several.data.map((e) => e.type)).toEqual(['payment_intent.canceled', 'payment_intent.succeeded']);
    const paged = await standIn.stripe.events.list({ limit: 1 }).autoPagingToArray({ limit: 10 });
    expect(paged.map((e) => e.id)).toEqual(all.data.map((e) => e.id));

    const one = await standIn.stripe.events.retrieve(all.data[0]!.id);
    expect(one.type).toBe('payment_intent.canceled');
    expect(one.data.previous_attributes).toMatchObject({ status: 'requires_payment_method', canceled_at: null });
    expect(one.api_version).toBeTruthy();
  });

  it('answers an unknown event with 404 resource_missing', async () => {
    await expect(standIn.stripe.events.retrieve('evt_missing')).rejects.toMatchObject({
      statusCode: 404,
      code: 'resource_missing',
    });
  });

  it('keeps connected-account events apart from the platform events', async () => {
    const account = await standIn.stripe.accounts.create({ type: 'express' });
    await standIn.stripe.accounts.update(account.id, { metadata: { participant: 'p031' } });
    expect((await standIn.stripe.events.list({ type: 'account.updated' })).data).toHaveLength(0);
    const own = await standIn.stripe.events.list({ type: 'account.updated' }, { stripeAccount: account.id });
    expect(own.data).toHaveLength(1);
    await expect(standIn.stripe.events.retrieve(own.data[0]!.id)).rejects.toMatchObject({ code: 'resource_missing' });
  });
});
