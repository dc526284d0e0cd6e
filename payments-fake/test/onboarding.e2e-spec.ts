// Account links and the hosted onboarding page. Behaviour checked against
// https://docs.stripe.com/api/account_links/object and /create (single-use URL, expires_at,
// refresh_url for an expired or visited link, return_url when the holder leaves or finishes)
// and https://docs.stripe.com/connect/express-accounts (details_submitted, payouts_enabled and
// capabilities once onboarding is complete; account.updated tells the platform).
import Stripe from 'stripe';
import { describe, expect, it } from 'vitest';
import { useSharedHarness, waitFor, WEBHOOK_SECRET } from './support/harness';
import { caught } from './support/caught';

const standIn = useSharedHarness();
const REFRESH_URL = 'http://127.0.0.1:5173/payout-setup/refresh';
const RETURN_URL = 'http://127.0.0.1:5173/payout-setup/done';

async function newLink(accountId: string) {
  return standIn.stripe.accountLinks.create({
    account: accountId,
    type: 'account_onboarding',
    refresh_url: REFRESH_URL,
    return_url: RETURN_URL,
  });
}

function formAction(html: string): string {
  const action = /<form[^>]*action="([^"]+)"/.exec(html)?.[1];
  if (!action) throw new Error('no form on the page');
  return new URL(action, standIn.harness.fake.url).toString();
}

function submit(action: string, fields: Record<string, string>) {
  return fetch(action, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'Content-Type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams(fields).toString(),
  });
}

describe('account links', () => {
  it('returns an account_link with a loopback URL that expires in about five minutes', async () => {
    const account = await standIn.stripe.accounts.create({ type: 'express' });
    const link = await newLink(account.id);
    expect(link.object).toBe('account_link');
    expect(link.expires_at - link.created).toBe(300);
    expect(link.url.startsWith(`${standIn.harness.fake.url}/onboarding/`)).toBe(true);
  });

  it('refuses a missing return_url and an unknown account', async () => {
    const account = await standIn.stripe.accounts.create({ type: 'express' });
    const missing = await caught(
      standIn.stripe.accountLinks.create({ account: account.id, type: 'account_onboarding', refresh_url: REFRESH_URL }),
    );
    expect(missing.code).toBe('parameter_missing');
    expect(missing.param).toBe('return_url');
    const unknown = await caught(newLink('acct_0000000000000000'));
    expect(unknown.param).toBe('account');
    const badUrl = await caught(
      standIn.stripe.accountLinks.create({
        account: account.id,
        type: 'account_onboarding',
        refresh_url: 'not a url',
        return_url: RETURN_URL,
      }),
    );
    expect(badUrl.param).toBe('refresh_url');
  });
});

describe('hosted onboarding', () => {
  it('completes onboarding, redirects to return_url and sends a verifiable account.updated', async () => {
    const account = await standIn.stripe.accounts.create({
      type: 'express',
      email: 'p020@evenhand.test',
      capabilities: { transfers: { requested: true } },
    });
    const link = await newLink(account.id);
    const page = await fetch(link.url);
    expect(page.status).toBe(200);
    expect(page.headers.get('content-type')).toMatch(/text\/html/);
    const html = await page.text();
    expect(html).toContain('Where your payments go');
    expect(html).toContain('Local stand-in for the payment provider');
    expect(html).toContain('p020@evenhand.test');
    expect(html).toMatch(/<label for="full_name">/);

    const done = await submit(formAction(html), { full_name: 'Avery Quill', confirmed: 'yes', action: 'complete' });
    expect(done.status).toBe(303);
    expect(done.headers.get('location')).toBe(RETURN_URL);

    const onboarded = await standIn.stripe.accounts.retrieve(account.id);
    expect(onboarded.details_submitted).toBe(true);
    expect(onboarded.payouts_enabled).toBe(true);
    expect(onboarded.capabilities).toEqual({ transfers: 'active' });
    // An account that only receives transfers has no card_payments capability, so it cannot charge.
    expect(onboarded.charges_enabled).toBe(false);
    expect(onboarded.requirements?.currently_due).toEqual([]);
    expect(onboarded.external_accounts?.data[0]).toMatchObject({ object: 'bank_account', last4: '6789' });

    await waitFor(
      () => standIn.harness.receiver.received.some((hook) => hook.type === 'account.updated'),
      10_000,
      'account.updated',
    );
    const hook = standIn.harness.receiver.received.find((received) => received.type === 'account.updated');
    const event = standIn.stripe.webhooks.constructEvent(hook!.rawBody, hook!.signature, WEBHOOK_SECRET);
    expect(event.type).toBe('account.updated');
    expect(event.account).toBe(account.id);
    const object = event.data.object as Stripe.Account;
    expect(object.payouts_enabled).toBe(true);
    expect(event.data.previous_attributes).toMatchObject({ details_submitted: false, payouts_enabled: false });
  });

  it('enables charges when card_payments was requested', async () => {
    const account = await standIn.stripe.accounts.create({
      type: 'express',
      capabilities: { card_payments: { requested: true }, transfers: { requested: true } },
    });
    const html = await (await fetch((await newLink(account.id)).url)).text();
    await submit(formAction(html), { full_name: 'Avery Quill', confirmed: 'yes', action: 'complete' });
    const onboarded = await standIn.stripe.accounts.retrieve(account.id);
    expect(onboarded.charges_enabled).toBe(true);
    expect(onboarded.capabilities).toEqual({ card_payments: 'active', transfers: 'active' });
  });

  it('is single-use: a second visit goes to refresh_url', async () => {
    const account = await standIn.stripe.accounts.create({ type: 'express' });
    const link = await newLink(account.id);
    expect((await fetch(link.url)).status).toBe(200);
    const again = await fetch(link.url, { redirect: 'manual' });
    expect(again.status).toBe(302);
    expect(again.headers.get('location')).toBe(REFRESH_URL);
  });

  it('sends an expired link to refresh_url', async () => {
    const account = await standIn.stripe.accounts.create({ type: 'express' });
    const link = await newLink(account.id);
    await standIn.harness.control('/clock', { advanceSeconds: 301 });
    const expired = await fetch(link.url, { redirect: 'manual' });
    expect(expired.status).toBe(302);
    expect(expired.headers.get('location')).toBe(REFRESH_URL);
    expect((await standIn.stripe.accounts.retrieve(account.id)).details_submitted).toBe(false);
  });

  it('shows the problems by field and keeps the account unchanged when the form is incomplete', async () => {
    const account = await standIn.stripe.accounts.create({ type: 'express' });
    const html = await (await fetch((await newLink(account.id)).url)).text();
    const action = formAction(html);
    const refused = await submit(action, { full_name: '  ', action: 'complete' });
    expect(refused.status).toBe(422);
    const page = await refused.text();
    expect(page).toContain('role="alert"');
    expect(page).toContain('Name on your bank account: write your name.');
    expect(page).toContain('Confirmation: tick the box');
    expect(page).toContain('aria-invalid="true"');
    expect((await standIn.stripe.accounts.retrieve(account.id)).details_submitted).toBe(false);
    // The same session still works once corrected.
    const done = await submit(action, { full_name: 'Avery Quill', confirmed: 'yes', action: 'complete' });
    expect(done.status).toBe(303);
  });

  it('escapes what it shows from the account', async () => {
    const account = await standIn.stripe.accounts.create({ type: 'express', email: 'p"<b>x</b>@evenhand.test' });
    const html = await (await fetch((await newLink(account.id)).url)).text();
    expect(html).not.toContain('<b>x</b>');
    expect(html).toContain('&lt;b&gt;x&lt;/b&gt;');
  });

  it('lets the holder leave without finishing: return_url, account unchanged, session closed', async () => {
    const account = await standIn.stripe.accounts.create({ type: 'express' });
    const html = await (await fetch((await newLink(account.id)).url)).text();
    const action = formAction(html);
    const left = await submit(action, { action: 'leave' });
    expect(left.status).toBe(303);
    expect(left.headers.get('location')).toBe(RETURN_URL);
    expect((await standIn.stripe.accounts.retrieve(account.id)).details_submitted).toBe(false);
    const reuse = await submit(action, { full_name: 'Avery Quill', confirmed: 'yes', action: 'complete' });
    expect(reuse.status).toBe(303);
    expect(reuse.headers.get('location')).toBe(REFRESH_URL);
  });

  it('answers an unknown link with a 404 page', async () => {
    const response = await fetch(`${standIn.harness.fake.url}/onboarding/not-a-real-token`);
    expect(response.status).toBe(404);
    expect(await response.text()).toContain('Link not valid');
  });
});
