// Connected accounts and the provider's request/response conventions, driven through the
// official SDK (stripe 23.1.0). Shapes checked against:
//   account object          https://docs.stripe.com/api/accounts/object
//   list object, pagination https://docs.stripe.com/api/pagination
//   errors                  https://docs.stripe.com/api/errors, https://docs.stripe.com/error-codes
//   authentication          https://docs.stripe.com/api/authentication
//   metadata                https://docs.stripe.com/metadata
import Stripe from 'stripe';
import { describe, expect, it } from 'vitest';
import { useSharedHarness } from './support/harness';
import { caught } from './support/caught';

const standIn = useSharedHarness();

describe('connected accounts', () => {
  it('creates an express account with capabilities and metadata, not yet enabled', async () => {
    const account = await standIn.stripe.accounts.create({
      type: 'express',
      country: 'us',
      email: 'p001@evenhand.test',
      capabilities: { transfers: { requested: true } },
      metadata: { participant: 'p001', study: 'wayfinding-cues' },
    });
    expect(account.id).toMatch(/^acct_[A-Za-z0-9]{16}$/);
    expect(account.object).toBe('account');
    expect(typeof account.created).toBe('number');
    expect(account.type).toBe('express');
    expect(account.country).toBe('US');
    expect(account.default_currency).toBe('usd');
    expect(account.email).toBe('p001@evenhand.test');
    expect(account.capabilities).toEqual({ transfers: 'inactive' });
    expect(account.metadata).toEqual({ participant: 'p001', study: 'wayfinding-cues' });
    expect(account.charges_enabled).toBe(false);
    expect(account.payouts_enabled).toBe(false);
    expect(account.details_submitted).toBe(false);
    expect(account.requirements?.currently_due).toContain('external_account');
    expect(account.lastResponse.statusCode).toBe(200);
    expect(account.lastResponse.requestId).toMatch(/^req_/);
  });

  it('retrieves what it created', async () => {
    const created = await standIn.stripe.accounts.create({
      type: 'custom',
      country: 'DE',
      email: 'p002@evenhand.test',
    });
    const fetched = await standIn.stripe.accounts.retrieve(created.id);
    expect(fetched.id).toBe(created.id);
    expect(fetched.type).toBe('custom');
    expect(fetched.default_currency).toBe('eur');
  });

  it('merges metadata on update, removes a key sent empty, and emits account.updated', async () => {
    const created = await standIn.stripe.accounts.create({
      type: 'express',
      metadata: { participant: 'p003', cohort: 'a' },
    });
    const updated = await standIn.stripe.accounts.update(created.id, {
      email: 'p003@evenhand.test',
      metadata: { cohort: '', condition: 'map-cues' },
    });
    expect(updated.metadata).toEqual({ participant: 'p003', condition: 'map-cues' });
    expect(updated.email).toBe('p003@evenhand.test');

    const events = await standIn.stripe.events.list({ type: 'account.updated' }, { stripeAccount: created.id });
    expect(events.data).toHaveLength(1);
    expect(events.data[0]?.account).toBe(created.id);
    expect(events.data[0]?.data.previous_attributes).toMatchObject({ email: null });
  });

  it('adds a requested capability on update and drops one sent with requested=false', async () => {
    const created = await standIn.stripe.accounts.create({
      type: 'express',
      capabilities: { transfers: { requested: true }, card_payments: { requested: false } },
    });
    expect(created.capabilities).toEqual({ transfers: 'inactive' });
    const added = await standIn.stripe.accounts.update(created.id, {
      capabilities: { card_payments: { requested: true } },
    });
    expect(added.capabilities).toEqual({ transfers: 'inactive', card_payments: 'inactive' });
    const dropped = await standIn.stripe.accounts.update(created.id, {
      capabilities: { card_payments: { requested: false } },
    });
    expect(dropped.capabilities).toEqual({ transfers: 'inactive' });
  });

  it('clears all metadata when metadata is sent empty', async () => {
    const created = await standIn.stripe.accounts.create({ type: 'express', metadata: { a: '1', b: '2' } });
    const updated = await standIn.stripe.accounts.update(created.id, {
      metadata: '' as unknown as Stripe.MetadataParam,
    });
    expect(updated.metadata).toEqual({});
  });

  it('lists newest first with limit, starting_after and has_more, and auto-pagination sees each once', async () => {
    const ids: string[] = [];
    for (let i = 0; i < 5; i++) ids.push((await standIn.stripe.accounts.create({ type: 'express' })).id);
    const newestFirst = [...ids].reverse();

    const first = await standIn.stripe.accounts.list({ limit: 2 });
    expect(first.object).toBe('list');
    expect(first.url).toBe('/v1/accounts');
    expect(first.has_more).toBe(true);
    expect(first.data.map((a) => a.id)).toEqual(newestFirst.slice(0, 2));

    const second = await standIn.stripe.accounts.list({ limit: 2, starting_after: first.data[1]?.id });
    expect(second.data.map((a) => a.id)).toEqual(newestFirst.slice(2, 4));

    const before = await standIn.stripe.accounts.list({ limit: 10, ending_before: newestFirst[2] });
    expect(before.data.map((a) => a.id)).toEqual(newestFirst.slice(0, 2));
    expect(before.has_more).toBe(false);

    // The SDK's own auto-pagination follows starting_after; it would repeat or skip ids if the cursor were wrong.
    const all = await standIn.stripe.accounts.list({ limit: 2 }).autoPagingToArray({ limit: 100 });
    expect(all.map((a) => a.id)).toEqual(newestFirst);
  });

  it('deletes an account', async () => {
    const created = await standIn.stripe.accounts.create({ type: 'express' });
    const deleted = await standIn.stripe.accounts.del(created.id);
    expect(deleted).toMatchObject({ id: created.id, object: 'account', deleted: true });
    const error = await caught(standIn.stripe.accounts.retrieve(created.id));
    expect(error).toBeInstanceOf(Stripe.errors.StripePermissionError);
  });

  it('returns the platform account on GET /v1/account', async () => {
    const platform = await standIn.stripe.accounts.retrieveCurrent();
    expect(platform.id).toBe(standIn.harness.fake.world.platformAccountId);
    expect(platform.charges_enabled).toBe(true);
  });
});

describe('errors as the SDK surfaces them', () => {
  it('refuses an unknown parameter with parameter_unknown and names it', async () => {
    const error = await caught(standIn.stripe.accounts.create({ type: 'express', favourite_colour: 'teal' } as never));
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(error.statusCode).toBe(400);
    expect(error.type).toBe('StripeInvalidRequestError');
    expect(error.raw.type).toBe('invalid_request_error');
    expect(error.code).toBe('parameter_unknown');
    expect(error.param).toBe('favourite_colour');
  });

  it('names a nested unknown parameter in bracket notation', async () => {
    const error = await caught(
      standIn.stripe.accounts.create({ type: 'express', capabilities: { telepathy: { requested: true } } } as never),
    );
    expect(error.code).toBe('parameter_unknown');
    expect(error.param).toBe('capabilities[telepathy]');
  });

  it('refuses a missing required parameter with parameter_missing', async () => {
    const error = await caught(standIn.stripe.accounts.create({ country: 'US' } as never));
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(error.code).toBe('parameter_missing');
    expect(error.param).toBe('type');
    expect(error.message).toContain('type');
  });

  it('refuses a bad enum, email and boolean naming the field', async () => {
    const badType = await caught(standIn.stripe.accounts.create({ type: 'premium' } as never));
    expect(badType.param).toBe('type');
    const badEmail = await caught(standIn.stripe.accounts.create({ type: 'express', email: 'not-an-email' }));
    expect(badEmail.code).toBe('email_invalid');
    expect(badEmail.param).toBe('email');
    const badBoolean = await caught(
      standIn.stripe.accounts.create({ type: 'express', capabilities: { transfers: { requested: 'maybe' } } } as never),
    );
    expect(badBoolean.param).toBe('capabilities[transfers][requested]');
  });

  it('enforces the metadata limits', async () => {
    const longKey = 'k'.repeat(41);
    const error = await caught(standIn.stripe.accounts.create({ type: 'express', metadata: { [longKey]: 'v' } }));
    expect(error.param).toBe(`metadata[${longKey}]`);
    const tooMany = Object.fromEntries(Array.from({ length: 51 }, (_, i) => [`key${i}`, 'v']));
    const many = await caught(standIn.stripe.accounts.create({ type: 'express', metadata: tooMany }));
    expect(many).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(many.param).toBe('metadata');
  });

  it('answers an unknown account with 403 account_invalid (StripePermissionError)', async () => {
    const error = await caught(standIn.stripe.accounts.retrieve('acct_0000000000000000'));
    expect(error).toBeInstanceOf(Stripe.errors.StripePermissionError);
    expect(error.statusCode).toBe(403);
    expect(error.code).toBe('account_invalid');
  });

  it('answers an unknown path with 404 invalid_request_error', async () => {
    const error = await caught(standIn.stripe.rawRequest('GET', '/v1/teleporters', {}));
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(error.statusCode).toBe(404);
    expect(error.message).toContain('/v1/teleporters');
  });

  it('refuses live keys with 401 (StripeAuthenticationError)', async () => {
    // A pk_test_ key is the browser's: see publishable-key.e2e-spec.ts for its 403 on this endpoint.
    for (const key of ['sk_live_notallowedhere1234', 'pk_live_publishable1234']) {
      const error = await caught(standIn.harness.stripe({ key }).balance.retrieve());
      expect(error).toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
      expect(error.statusCode).toBe(401);
      expect(error.raw.type).toBe('invalid_request_error');
      expect(error.message).not.toContain(key);
    }
  });

  it('refuses a request without a key with 401 in the provider error shape', async () => {
    const response = await fetch(`${standIn.harness.fake.url}/v1/balance`);
    expect(response.status).toBe(401);
    const body = (await response.json()) as { error: { type: string; message: string } };
    expect(body.error.type).toBe('invalid_request_error');
    expect(body.error.message).toMatch(/API key/);
  });

  it('refuses a JSON body: the API takes form encoding only', async () => {
    const response = await fetch(`${standIn.harness.fake.url}/v1/accounts`, {
      method: 'POST',
      headers: { Authorization: 'Bearer sk_test_json_4242', 'Content-Type': 'application/json' },
      body: JSON.stringify({ type: 'express' }),
    });
    expect(response.status).toBe(400);
    const body = (await response.json()) as { error: { message: string } };
    expect(body.error.message).toContain('application/json');
  });

  it('accepts expand[] with empty brackets as the browser library sends it, and refuses unknown expansions', async () => {
    const response = await fetch(`${standIn.harness.fake.url}/v1/accounts`, {
      method: 'POST',
      headers: { Authorization: 'Bearer sk_test_form_4242', 'Content-Type': 'application/x-www-form-urlencoded' },
      body: 'type=express&metadata[note]=a+b%26c&expand[]=business_profile',
    });
    expect(response.status).toBe(400);
    const body = (await response.json()) as { error: { param: string; message: string } };
    expect(body.error.param).toBe('expand');
    expect(body.error.message).toContain('business_profile');
  });

  it('decodes + and percent-escapes in form values', async () => {
    const response = await fetch(`${standIn.harness.fake.url}/v1/accounts`, {
      method: 'POST',
      headers: { Authorization: 'Bearer sk_test_form_4242', 'Content-Type': 'application/x-www-form-urlencoded' },
      body: 'type=express&metadata[note]=a+b%26c%3D%C3%A9',
    });
    expect(response.status).toBe(200);
    const account = (await response.json()) as { metadata: Record<string, string> };
    expect(account.metadata.note).toBe('a b&c=é');
  });
});
