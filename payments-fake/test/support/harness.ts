// Starts the stand-in in-process on a free port, with a webhook receiver beside it, and builds
// clients of the official provider SDK pointed at it.

import { createServer, type IncomingHttpHeaders, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import Stripe from 'stripe';
import { afterAll, beforeAll, beforeEach } from 'vitest';
import { startPaymentsFake, type PaymentsFakeOptions, type RunningPaymentsFake } from '../../src/app/payments-fake-app';

export const TEST_SECRET_KEY = 'sk_test_evenhand_local_4242';
export const WEBHOOK_SECRET = 'whsec_evenhand_test';

export interface ReceivedWebhook {
  rawBody: string;
  headers: IncomingHttpHeaders;
  signature: string;
  eventId: string;
  type: string;
}

export interface WebhookReceiver {
  url: string;
  received: ReceivedWebhook[];
  /** Statuses to answer with, in turn; 200 once the list runs out. */
  answerWith(statuses: number[]): void;
  close(): Promise<void>;
}

function listen(server: Server): Promise<number> {
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => resolve((server.address() as AddressInfo).port));
  });
}

export async function startWebhookReceiver(): Promise<WebhookReceiver> {
  const received: ReceivedWebhook[] = [];
  let statuses: number[] = [];
  const server = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (chunk: Buffer) => chunks.push(chunk));
    req.on('end', () => {
      const rawBody = Buffer.concat(chunks).toString('utf8');
      const parsed = JSON.parse(rawBody) as { id: string; type: string };
      received.push({
        rawBody,
        headers: req.headers,
        signature: String(req.headers['stripe-signature'] ?? ''),
        eventId: parsed.id,
        type: parsed.type,
      });
      const status = statuses.shift() ?? 200;
      res.writeHead(status, { 'Content-Type': 'application/json' }).end('{"received":true}');
    });
  });
  const port = await listen(server);
  return {
    url: `http://127.0.0.1:${port}/api/webhooks/payments`,
    received,
    answerWith: (next) => {
      statuses = [...next];
    },
    close: () =>
      new Promise((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}

export interface Harness {
  fake: RunningPaymentsFake;
  receiver: WebhookReceiver;
  stripe(config?: Partial<Stripe.StripeConfig> & { key?: string }): Stripe;
  control(path: string, body?: unknown, method?: string): Promise<{ status: number; body: any }>;
  close(): Promise<void>;
}

/** `receiver`: deliver to this receiver (kept open on close) instead of a new one of its own. */
export async function startHarness(
  options: Partial<PaymentsFakeOptions> = {},
  shared: { receiver?: WebhookReceiver } = {},
): Promise<Harness> {
  const receiver = shared.receiver ?? (await startWebhookReceiver());
  const fake = await startPaymentsFake({
    host: '127.0.0.1',
    port: 0,
    webhookUrl: receiver.url,
    webhookSecret: WEBHOOK_SECRET,
    webhookRetryDelaysMs: [50, 100],
    webhookReorderWindowMs: 100,
    payoutSettleMs: 60_000,
    ...options,
  });
  return {
    fake,
    receiver,
    stripe: ({ key, ...config } = {}) =>
      new Stripe(key ?? TEST_SECRET_KEY, {
        host: '127.0.0.1',
        port: fake.port,
        protocol: 'http',
        maxNetworkRetries: 0,
        telemetry: false,
        ...config,
      }),
    control: async (path, body, method = 'POST') => {
      const response = await fetch(`${fake.url}/_control${path}`, {
        method,
        headers: body === undefined ? {} : { 'Content-Type': 'application/json' },
        body: body === undefined ? undefined : JSON.stringify(body),
      });
      return { status: response.status, body: await response.json() };
    },
    close: async () => {
      await fake.close();
      if (!shared.receiver) await receiver.close();
    },
  };
}

export async function waitFor(check: () => boolean, timeoutMs = 10_000, what = 'condition'): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!check()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 15));
  }
}

/** A connected account that has finished onboarding, so it can receive transfers and pay out. */
export async function onboardedAccount(
  harness: Harness,
  stripe: Stripe,
  capabilities: Stripe.AccountCreateParams.Capabilities = { transfers: { requested: true } },
): Promise<Stripe.Account> {
  const account = await stripe.accounts.create({
    type: 'express',
    country: 'US',
    email: 'p001@evenhand.test',
    capabilities,
  });
  const link = await stripe.accountLinks.create({
    account: account.id,
    type: 'account_onboarding',
    refresh_url: 'http://127.0.0.1:5173/payout-setup/refresh',
    return_url: 'http://127.0.0.1:5173/payout-setup/done',
  });
  const page = await fetch(link.url);
  const html = await page.text();
  const action = /action="([^"]+)"/.exec(html)?.[1];
  if (!action) throw new Error('the onboarding page has no form');
  const done = await fetch(new URL(action, harness.fake.url), {
    method: 'POST',
    redirect: 'manual',
    headers: { 'Content-Type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ full_name: 'Rowan Vale', confirmed: 'yes', action: 'complete' }).toString(),
  });
  if (done.status !== 303) throw new Error(`onboarding did not finish (status ${done.status})`);
  return stripe.accounts.retrieve(account.id);
}

/**
 * One stand-in for a whole test file, reset before each test (state, received webhooks, queued answers). Call it at
 * the top of the file; the returned object's fields are filled in once the file's tests start.
 */
export function useSharedHarness(): { harness: Harness; stripe: Stripe } {
  const standIn = {} as { harness: Harness; stripe: Stripe };
  beforeAll(async () => {
    standIn.harness = await startHarness();
    standIn.stripe = standIn.harness.stripe();
  });
  afterAll(() => standIn.harness.close());
  beforeEach(async () => {
    await standIn.harness.control('/reset');
    standIn.harness.receiver.received.length = 0;
    standIn.harness.receiver.answerWith([]);
  });
  return standIn;
}
