// The browser-facing side of the REST stand-in: publishable keys, client secrets, typed cards and
// CORS, as the browser script uses them (its own journey is in browser-card-entry.e2e-spec.ts).
// Checked against:
//   key kinds                        https://docs.stripe.com/keys
//   publishable key on a secret-only endpoint: 403 with code secret_key_required (from memory of the
//                                    provider's answer; the official SDK raises StripePermissionError)
//   retrieve with client_secret      https://docs.stripe.com/api/payment_intents/retrieve
//   confirm with payment_method_data https://docs.stripe.com/api/payment_intents/confirm
//   test cards, declines             https://docs.stripe.com/testing, https://docs.stripe.com/declines/codes
//   CORS protocol                    https://fetch.spec.whatwg.org/#http-cors-protocol
import Stripe from 'stripe';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { startHarness, waitFor, type Harness } from './support/harness';
import { caught } from './support/caught';

const PUBLISHABLE_KEY = 'pk_test_evenhand_local_browser';
const ADMIN_ORIGIN = 'http://127.0.0.1:5184';
const FUTURE_YEAR = new Date().getFullYear() + 3;

let harness: Harness;
let stripe: Stripe;
let browserSdk: Stripe;

beforeAll(async () => {
  harness = await startHarness();
  stripe = harness.stripe();
  browserSdk = harness.stripe({ key: PUBLISHABLE_KEY });
});
afterAll(() => harness.close());
beforeEach(async () => {
  await harness.control('/reset');
});

/** A call as the browser script makes it: publishable key, form body, the admin's Origin. */
async function browserCall(
  path: string,
  body: Record<string, string> | null,
  options: { key?: string; origin?: string } = {},
) {
  const response = await fetch(`${harness.fake.url}${path}`, {
    method: body ? 'POST' : 'GET',
    headers: {
      Authorization: `Bearer ${options.key ?? PUBLISHABLE_KEY}`,
      Origin: options.origin ?? ADMIN_ORIGIN,
      ...(body ? { 'Content-Type': 'application/x-www-form-urlencoded' } : {}),
    },
    body: body ? new URLSearchParams(body).toString() : undefined,
  });
  return { status: response.status, headers: response.headers, body: (await response.json()) as any };
}

function typedCard(number: string, extra: Record<string, string> = {}): Record<string, string> {
  return {
    'payment_method_data[type]': 'card',
    'payment_method_data[card][number]': number,
    'payment_method_data[card][exp_month]': '12',
    'payment_method_data[card][exp_year]': String(FUTURE_YEAR),
    'payment_method_data[card][cvc]': '123',
    ...extra,
  };
}

async function fundingIntent(amount = 40_000): Promise<Stripe.PaymentIntent> {
  return stripe.paymentIntents.create({
    amount,
    currency: 'usd',
    description: 'Fund study: Wayfinding cues',
    metadata: { study: 'wayfinding-cues' },
  });
}

describe('publishable keys', () => {
  it('refuses every secret-only endpoint with 403 secret_key_required', async () => {
    const intent = await fundingIntent();
    const attempts = [
      browserSdk.balance.retrieve(),
      browserSdk.paymentIntents.create({ amount: 1_000, currency: 'usd' }),
      browserSdk.paymentIntents.list(),
      browserSdk.paymentIntents.cancel(intent.id),
      browserSdk.transfers.list(),
      browserSdk.accounts.create({ type: 'express' }),
      browserSdk.events.list(),
    ];
    for (const attempt of attempts) {
      const error = await caught(attempt);
      expect(error).toBeInstanceOf(Stripe.errors.StripePermissionError);
      expect(error.statusCode).toBe(403);
      expect(error.code).toBe('secret_key_required');
      expect(error.raw.type).toBe('invalid_request_error');
    }
    expect((await stripe.paymentIntents.retrieve(intent.id)).status).toBe('requires_payment_method');
  });

  it('still refuses a live publishable key with 401', async () => {
    const error = await caught(harness.stripe({ key: 'pk_live_evenhand_0000' }).paymentIntents.retrieve('pi_x'));
    expect(error).toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    expect(error.statusCode).toBe(401);
  });

  it('retrieves a payment intent by its client_secret, with only the fields a browser may read', async () => {
    const intent = await fundingIntent();
    expect(intent.client_secret).toMatch(new RegExp(`^${intent.id}_secret_[A-Za-z0-9]+$`));
    const seen = await browserSdk.paymentIntents.retrieve(intent.id, { client_secret: intent.client_secret as string });
    expect(seen).toMatchObject({
      id: intent.id,
      object: 'payment_intent',
      amount: 40_000,
      currency: 'usd',
      status: 'requires_payment_method',
      client_secret: intent.client_secret,
      description: 'Fund study: Wayfinding cues',
      livemode: false,
    });
    // Metadata and money details stay with the secret key
    // (@stripe/stripe-js 10.2.1 types the browser's PaymentIntent without them).
    expect(seen).not.toHaveProperty('metadata');
    expect(seen).not.toHaveProperty('amount_received');
    expect(seen).not.toHaveProperty('transfer_group');
  });

  it('refuses a browser retrieve without the client_secret or with another intent’s', async () => {
    const intent = await fundingIntent();
    const other = await fundingIntent(5_000);
    const missing = await caught(browserSdk.paymentIntents.retrieve(intent.id));
    expect(missing.statusCode).toBe(400);
    expect(missing.code).toBe('parameter_missing');
    expect(missing.param).toBe('client_secret');
    const wrong = await caught(
      browserSdk.paymentIntents.retrieve(intent.id, { client_secret: other.client_secret as string }),
    );
    expect(wrong.statusCode).toBe(400);
    expect(wrong.param).toBe('client_secret');
  });
});

describe('confirming with a typed card', () => {
  it('succeeds with 4242 4242 4242 4242, credits the platform and sends payment_intent.succeeded', async () => {
    const intent = await fundingIntent();
    const before = await stripe.balance.retrieve();
    const answer = await browserCall(
      `/v1/payment_intents/${intent.id}/confirm`,
      typedCard('4242 4242 4242 4242', {
        client_secret: intent.client_secret as string,
        'payment_method_data[billing_details][name]': 'Harbor Lane Cognition Lab',
        'payment_method_data[billing_details][address][postal_code]': '12345',
      }),
    );
    expect(answer.status).toBe(200);
    expect(answer.headers.get('access-control-allow-origin')).toBe(ADMIN_ORIGIN);
    expect(answer.body.status).toBe('succeeded');
    expect(answer.body.payment_method).toMatch(/^pm_/);
    expect(answer.body).not.toHaveProperty('metadata');

    const after = await stripe.paymentIntents.retrieve(intent.id);
    expect(after.status).toBe('succeeded');
    expect(after.amount_received).toBe(40_000);
    const balance = await stripe.balance.retrieve();
    expect(balance.available[0]?.amount).toBe((before.available[0]?.amount ?? 0) + 40_000);
    await waitFor(
      () =>
        harness.receiver.received.some(
          (hook) => hook.type === 'payment_intent.succeeded' && JSON.parse(hook.rawBody).data.object.id === intent.id,
        ),
      10_000,
      'payment_intent.succeeded webhook',
    );
  });

  it('declines 4000 0000 0000 0002 and 4000 0000 0000 9995 with a 402 card_error, and the intent stays open', async () => {
    const intent = await fundingIntent();
    const clientSecret = intent.client_secret as string;
    const generic = await browserCall(
      `/v1/payment_intents/${intent.id}/confirm`,
      typedCard('4000000000000002', { client_secret: clientSecret }),
    );
    expect(generic.status).toBe(402);
    expect(generic.body.error).toMatchObject({
      type: 'card_error',
      code: 'card_declined',
      decline_code: 'generic_decline',
    });
    expect(generic.body.error.payment_intent).toMatchObject({ id: intent.id, status: 'requires_payment_method' });
    expect(generic.body.error.payment_intent).not.toHaveProperty('metadata');

    const funds = await browserCall(
      `/v1/payment_intents/${intent.id}/confirm`,
      typedCard('4000000000009995', { client_secret: clientSecret }),
    );
    expect(funds.status).toBe(402);
    expect(funds.body.error).toMatchObject({
      type: 'card_error',
      code: 'card_declined',
      decline_code: 'insufficient_funds',
    });
    expect((await stripe.paymentIntents.retrieve(intent.id)).last_payment_error?.decline_code).toBe(
      'insufficient_funds',
    );
    expect((await stripe.balance.retrieve()).available).toEqual([{ amount: 0, currency: 'usd' }]);
    expect((await stripe.events.list({ type: 'payment_intent.payment_failed' })).data).toHaveLength(2);
  });

  it('declines a valid number that is no test card as test_mode_live_card', async () => {
    const intent = await fundingIntent();
    // 4111 1111 1111 1111 passes the Luhn check (a long-standing sample number, from memory) but is not on the provider's list.
    const answer = await browserCall(
      `/v1/payment_intents/${intent.id}/confirm`,
      typedCard('4111111111111111', { client_secret: intent.client_secret as string }),
    );
    expect(answer.status).toBe(402);
    expect(answer.body.error).toMatchObject({ code: 'card_declined', decline_code: 'test_mode_live_card' });
  });

  it('rejects a mistyped number, a past expiry and a bad CVC before any charge, naming the field', async () => {
    const intent = await fundingIntent();
    const clientSecret = intent.client_secret as string;
    const path = `/v1/payment_intents/${intent.id}/confirm`;
    const mistyped = await browserCall(path, typedCard('4242424242424241', { client_secret: clientSecret }));
    expect(mistyped.status).toBe(402);
    expect(mistyped.body.error).toMatchObject({
      type: 'card_error',
      code: 'incorrect_number',
      param: 'payment_method_data[card][number]',
    });
    const expired = await browserCall(
      path,
      typedCard('4242424242424242', { client_secret: clientSecret, 'payment_method_data[card][exp_year]': '2020' }),
    );
    expect(expired.body.error).toMatchObject({
      code: 'invalid_expiry_year',
      param: 'payment_method_data[card][exp_year]',
    });
    const cvc = await browserCall(
      path,
      typedCard('4242424242424242', { client_secret: clientSecret, 'payment_method_data[card][cvc]': '12' }),
    );
    expect(cvc.body.error).toMatchObject({ code: 'invalid_cvc', param: 'payment_method_data[card][cvc]' });
    expect((await stripe.paymentIntents.retrieve(intent.id)).status).toBe('requires_payment_method');
  });

  it('needs the client_secret with a publishable key, and refuses typed card numbers with a secret key', async () => {
    const intent = await fundingIntent();
    const noSecret = await browserCall(`/v1/payment_intents/${intent.id}/confirm`, typedCard('4242424242424242'));
    expect(noSecret.status).toBe(400);
    expect(noSecret.body.error).toMatchObject({ code: 'parameter_missing', param: 'client_secret' });
    const server = await browserCall(`/v1/payment_intents/${intent.id}/confirm`, typedCard('4242424242424242'), {
      key: 'sk_test_evenhand_local_4242',
    });
    expect(server.status).toBe(400);
    expect(server.body.error.param).toBe('payment_method_data[card]');
    expect((await stripe.paymentIntents.retrieve(intent.id)).status).toBe('requires_payment_method');
  });

  it('refuses a second confirmation of a succeeded intent', async () => {
    const intent = await fundingIntent();
    const body = typedCard('4242424242424242', { client_secret: intent.client_secret as string });
    expect((await browserCall(`/v1/payment_intents/${intent.id}/confirm`, body)).status).toBe(200);
    const again = await browserCall(`/v1/payment_intents/${intent.id}/confirm`, body);
    expect(again.status).toBe(400);
    expect(again.body.error.code).toBe('payment_intent_unexpected_state');
    expect((await stripe.balance.retrieve()).available).toEqual([{ amount: 40_000, currency: 'usd' }]);
  });
});

describe('CORS for pages on loopback', () => {
  async function preflight(origin: string) {
    return fetch(`${harness.fake.url}/v1/payment_intents/pi_123/confirm`, {
      method: 'OPTIONS',
      headers: {
        Origin: origin,
        'Access-Control-Request-Method': 'POST',
        'Access-Control-Request-Headers': 'authorization,content-type',
      },
    });
  }

  it('answers the preflight of any loopback origin, naming it', async () => {
    for (const origin of ['http://127.0.0.1:5174', ADMIN_ORIGIN, 'http://localhost:5173']) {
      const response = await preflight(origin);
      expect(response.status).toBe(204);
      expect(response.headers.get('access-control-allow-origin')).toBe(origin);
      expect(response.headers.get('access-control-allow-methods')).toContain('POST');
      expect(response.headers.get('access-control-allow-headers')?.toLowerCase()).toContain('authorization');
      expect(response.headers.get('vary')).toContain('Origin');
    }
  });

  it('grants nothing to another site', async () => {
    const response = await preflight('https://example.org');
    expect(response.headers.get('access-control-allow-origin')).toBeNull();
    const answer = await browserCall('/v1/payment_intents/pi_123?client_secret=pi_123_secret_x', null, {
      origin: 'https://example.org',
    });
    expect(answer.headers.get('access-control-allow-origin')).toBeNull();
  });
});

describe('the browser script', () => {
  it('is served as JavaScript at /v1/stripe.js and /js/v3, defining window.Stripe', async () => {
    const script = await fetch(`${harness.fake.url}/v1/stripe.js`, { headers: { Origin: ADMIN_ORIGIN } });
    expect(script.status).toBe(200);
    expect(script.headers.get('content-type')).toBe('text/javascript; charset=utf-8');
    expect(script.headers.get('access-control-allow-origin')).toBe(ADMIN_ORIGIN);
    const text = await script.text();
    expect(text).toContain('window.Stripe');
    expect(text).toContain('"endive"');
    const alias = await fetch(`${harness.fake.url}/js/v3`);
    expect(await alias.text()).toBe(text);
  });

  it('answers 503 with a script that throws, when the script was never built', async () => {
    const unbuilt = await startHarness({ webhookUrl: null, browserScriptFile: '/nonexistent/stripe-js-stand-in.js' });
    try {
      const response = await fetch(`${unbuilt.fake.url}/v1/stripe.js`);
      expect(response.status).toBe(503);
      expect(await response.text()).toMatch(/^throw new Error\(".*npm run build -w payments-fake"\);/);
    } finally {
      await unbuilt.close();
    }
  });
});
