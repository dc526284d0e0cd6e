// The browser script in a real browser (Debian's chromium through playwright-core): a page on
// another loopback port includes /v1/stripe.js, loads the real @stripe/stripe-js 10.2.1, calls
// loadStripe('pk_test_…'), mounts the card element, and pays a payment intent made with the SDK.
// Checked against:
//   loadStripe() with window.Stripe set   @stripe/stripe-js 10.2.1 dist/index.mjs (resolves with it, injects nothing)
//   confirmCardPayment result shapes      https://docs.stripe.com/js/payment_intents/confirm_card_payment
//   element change events                 https://docs.stripe.com/js/element/events/on_change
//   test cards                            https://docs.stripe.com/testing
//   accessibility                         axe-core 4 rules (WCAG 2.1 A/AA) through @axe-core/playwright
import AxeBuilder from '@axe-core/playwright';
import type { Page } from 'playwright-core';
import type Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser, screenshot, startTestPage, type BrowserSession, type TestPage } from './support/browser-page';
import { startHarness, waitFor, type Harness } from './support/harness';

const PUBLISHABLE_KEY = 'pk_test_evenhand_local_browser';
const EXPIRY = `12/${String((new Date().getFullYear() + 3) % 100).padStart(2, '0')}`;

// Functions passed to page.evaluate run in the page; this file is compiled without DOM types,
// so they reach the page's globals through globalThis.
let harness: Harness;
let stripe: Stripe;
let session: BrowserSession;
let testPage: TestPage;
let page: Page;
const consoleMessages: string[] = [];
const pageErrors: string[] = [];
const confirmRequests: string[] = [];

beforeAll(async () => {
  harness = await startHarness();
  stripe = harness.stripe();
  testPage = await startTestPage(harness.fake.url, PUBLISHABLE_KEY);
  session = await openBrowser();
  page = session.page;
  page.on('console', (message) => consoleMessages.push(`${message.type()}: ${message.text()}`));
  page.on('pageerror', (error) => pageErrors.push(error.message));
  page.on('request', (request) => {
    if (request.url().includes('/confirm')) confirmRequests.push(`${request.method()} ${request.url()}`);
  });
  await page.goto(testPage.url);
  await page.evaluate(() => (globalThis as any).appReady);
}, 90_000);

afterAll(async () => {
  await session?.close();
  await testPage?.close();
  await harness?.close();
});

function cardEvents(): Promise<any[]> {
  return page.evaluate(() => (globalThis as any).cardEvents);
}

async function lastChange(): Promise<any> {
  const events = await cardEvents();
  return events.filter((event) => event.type === 'change').at(-1);
}

async function typeCard(number: string, expiry = EXPIRY, cvc = '123', postalCode = '12345'): Promise<void> {
  await page.evaluate(() => (globalThis as any).testApp.clear());
  await page.getByLabel('Card number').pressSequentially(number);
  await page.getByLabel('Expiry date').pressSequentially(expiry);
  await page.getByLabel('Security code').pressSequentially(cvc);
  await page.getByLabel('Postal code').pressSequentially(postalCode);
}

function confirm(clientSecret: string): Promise<any> {
  return page.evaluate(
    ([secret]) => (globalThis as any).testApp.confirm(secret, { name: 'Harbor Lane Cognition Lab' }),
    [clientSecret] as const,
  );
}

async function fundingIntent(amount: number): Promise<Stripe.PaymentIntent> {
  return stripe.paymentIntents.create({
    amount,
    currency: 'usd',
    description: 'Fund study: Wayfinding cues',
    metadata: { study: 'wayfinding-cues' },
  });
}

async function availableUsd(): Promise<number> {
  return (await stripe.balance.retrieve()).available.find((entry) => entry.currency === 'usd')?.amount ?? 0;
}

describe('loading', () => {
  it('lets loadStripe() use window.Stripe from the stand-in and fetch nothing from the web', async () => {
    expect(await page.evaluate(() => (globalThis as any).testApp.stripeVersion)).toBe('endive');
    expect(session.offMachineRequests).toEqual([]);
    // loadStripe() warns when Stripe.version differs from its release train; it must stay quiet.
    expect(consoleMessages.filter((message) => message.includes('Stripe.js'))).toEqual([]);
    expect(pageErrors).toEqual([]);
    expect((await cardEvents()).map((event) => event.type)).toContain('ready');
  });
});

describe('the card form', () => {
  it('renders labelled inputs that the keyboard walks through in order, with no axe violations', async () => {
    for (const label of ['Card number', 'Expiry date (MM/YY)', 'Security code (CVC)', 'Postal code']) {
      await expect(page.getByLabel(label, { exact: true }).isVisible()).resolves.toBe(true);
    }
    await page.getByLabel('Card number').focus();
    const order: string[] = [];
    for (let i = 0; i < 4; i++) {
      order.push(await page.evaluate(() => (globalThis as any).document.activeElement.labels?.[0]?.textContent ?? ''));
      await page.keyboard.press('Tab');
    }
    expect(order).toEqual(['Card number', 'Expiry date (MM/YY)', 'Security code (CVC)', 'Postal code']);
    expect(await page.evaluate(() => (globalThis as any).document.activeElement?.textContent)).toBe('Pay $250.00');

    const axe = await new AxeBuilder({ page }).include('#pay').analyze();
    expect(axe.violations.map((violation) => `${violation.id}: ${violation.help}`)).toEqual([]);
    await screenshot(page, 'card-element-01-mounted');
  });

  it('formats as the payer types and reports problems in change events', async () => {
    await typeCard('4242424242424241', '', '', '');
    expect(await page.getByLabel('Card number').inputValue()).toBe('4242 4242 4242 4241');
    expect(await lastChange()).toMatchObject({
      elementType: 'card',
      complete: false,
      empty: false,
      brand: 'visa',
      error: { type: 'validation_error', code: 'invalid_number' },
    });
    expect(await page.getByLabel('Card number').getAttribute('aria-invalid')).toBe('true');
    expect(await page.locator('#card').getAttribute('class')).toContain('StripeElement--invalid');

    await typeCard('4242', '01/20', '', '');
    // The incomplete number shows once the payer has left it; the past expiry shows at once.
    expect(await lastChange()).toMatchObject({ error: { code: 'incomplete_number' } });
    await typeCard('4242424242424242', '0120', '', '');
    expect(await page.getByLabel('Expiry date').inputValue()).toBe('01/20');
    expect(await lastChange()).toMatchObject({ error: { code: 'invalid_expiry_year_past' } });
    await expect(page.locator('#card-error').textContent()).resolves.toContain('expired');
    await screenshot(page, 'card-element-02-invalid');
  });

  it('refuses to confirm an incomplete card without calling the stand-in', async () => {
    const intent = await fundingIntent(5_000);
    await typeCard('4242 4242', '', '', '');
    const before = confirmRequests.length;
    const result = await confirm(intent.client_secret as string);
    expect(result.paymentIntent).toBeUndefined();
    expect(result.error).toMatchObject({ type: 'validation_error', code: 'incomplete_number' });
    expect(confirmRequests.length).toBe(before);
  });
});

describe('paying', () => {
  it('confirms with 4242 4242 4242 4242: the intent succeeds, the balance grows, the webhook goes out', async () => {
    const intent = await fundingIntent(25_000);
    const before = await availableUsd();
    await typeCard('4242424242424242');
    expect(await lastChange()).toMatchObject({
      complete: true,
      empty: false,
      error: undefined,
      value: { postalCode: '12345' },
    });
    await screenshot(page, 'card-element-03-filled');

    const result = await confirm(intent.client_secret as string);
    expect(result.error).toBeUndefined();
    expect(result.paymentIntent).toMatchObject({ id: intent.id, status: 'succeeded', amount: 25_000, currency: 'usd' });
    expect(result.paymentIntent).not.toHaveProperty('metadata');

    const stored = await stripe.paymentIntents.retrieve(intent.id);
    expect(stored.status).toBe('succeeded');
    expect(stored.amount_received).toBe(25_000);
    expect(await availableUsd()).toBe(before + 25_000);
    await waitFor(
      () =>
        harness.receiver.received.some(
          (hook) => hook.type === 'payment_intent.succeeded' && JSON.parse(hook.rawBody).data.object.id === intent.id,
        ),
      10_000,
      'payment_intent.succeeded webhook',
    );

    const retrieved = await page.evaluate(([secret]) => (globalThis as any).testApp.retrieve(secret), [
      intent.client_secret as string,
    ] as const);
    expect(retrieved.paymentIntent).toMatchObject({ id: intent.id, status: 'succeeded' });
    expect(session.offMachineRequests).toEqual([]);
  });

  it('gives { error } for declined cards, leaving the intent open for another card', async () => {
    const intent = await fundingIntent(12_000);
    const before = await availableUsd();

    await typeCard('4000 0000 0000 0002');
    const declined = await confirm(intent.client_secret as string);
    expect(declined.paymentIntent).toBeUndefined();
    expect(declined.error).toMatchObject({
      type: 'card_error',
      code: 'card_declined',
      decline_code: 'generic_decline',
    });
    expect(declined.error.message).toEqual(expect.any(String));
    expect(declined.error.payment_intent).toMatchObject({ id: intent.id, status: 'requires_payment_method' });

    await typeCard('4000 0000 0000 9995');
    const noFunds = await confirm(intent.client_secret as string);
    expect(noFunds.error).toMatchObject({
      type: 'card_error',
      code: 'card_declined',
      decline_code: 'insufficient_funds',
    });
    expect((await stripe.paymentIntents.retrieve(intent.id)).last_payment_error?.decline_code).toBe(
      'insufficient_funds',
    );
    expect(await availableUsd()).toBe(before);

    await typeCard('4242 4242 4242 4242');
    const paid = await confirm(intent.client_secret as string);
    expect(paid.paymentIntent?.status).toBe('succeeded');
    expect(await availableUsd()).toBe(before + 12_000);
    expect(pageErrors).toEqual([]);
  });
});
