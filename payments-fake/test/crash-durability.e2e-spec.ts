// What the stand-in has acknowledged survives the process being killed outright (SIGKILL, no
// shutdown write): a transfer the caller saw confirmed is there after a restart, and so is its
// idempotent replay. Runs the built server (`npm run build`) as a child process, as `npm start` does.
import { type ChildProcess, spawn } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import path from 'node:path';
import Stripe from 'stripe';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';

const PACKAGE_ROOT = path.resolve(__dirname, '..');
const SERVER = path.join(PACKAGE_ROOT, 'dist/main.js');
const TEMP_ROOT = path.resolve(__dirname, '../../.local/tmp');

let folder: string;
let file: string;
const children = new Set<ChildProcess>();

beforeEach(() => {
  mkdirSync(TEMP_ROOT, { recursive: true });
  folder = mkdtempSync(path.join(TEMP_ROOT, 'payments-fake-crash-'));
  file = path.join(folder, 'state.json');
});
afterEach(async () => {
  for (const child of children) await stop(child, 'SIGKILL');
  rmSync(folder, { recursive: true, force: true });
});

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as { port: number };
      probe.close(() => resolve(port));
    });
  });
}

async function start(port: number): Promise<ChildProcess> {
  if (!existsSync(SERVER)) throw new Error(`${SERVER} is missing: run npm run build -w payments-fake first`);
  const child = spawn(process.execPath, [SERVER], {
    cwd: PACKAGE_ROOT,
    env: {
      ...process.env,
      PAYMENTS_FAKE_PORT: String(port),
      PAYMENTS_FAKE_WEBHOOK_URL: 'off',
      PAYMENTS_FAKE_STATE_FILE: file,
    },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  children.add(child);
  const deadline = Date.now() + 20_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`the stand-in exited with ${child.exitCode}`);
    try {
      if ((await fetch(`http://127.0.0.1:${port}/health`)).ok) return child;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error('the stand-in did not start');
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

function stop(child: ChildProcess, signal: NodeJS.Signals): Promise<void> {
  children.delete(child);
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve();
  return new Promise((resolve) => {
    child.once('exit', () => resolve());
    child.kill(signal);
  });
}

function client(port: number): Stripe {
  return new Stripe('sk_test_evenhand_crash', {
    host: '127.0.0.1',
    port,
    protocol: 'http',
    maxNetworkRetries: 0,
    telemetry: false,
  });
}

async function onboarded(port: number, stripe: Stripe): Promise<string> {
  const account = await stripe.accounts.create({
    type: 'express',
    country: 'US',
    capabilities: { transfers: { requested: true } },
  });
  const link = await stripe.accountLinks.create({
    account: account.id,
    type: 'account_onboarding',
    refresh_url: 'http://127.0.0.1:5173/r',
    return_url: 'http://127.0.0.1:5173/d',
  });
  const action = /action="([^"]+)"/.exec(await (await fetch(link.url)).text())?.[1];
  if (!action) throw new Error('the onboarding page has no form');
  const done = await fetch(new URL(action, `http://127.0.0.1:${port}`), {
    method: 'POST',
    redirect: 'manual',
    headers: { 'Content-Type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ full_name: 'Kit Crash', confirmed: 'yes', action: 'complete' }).toString(),
  });
  expect(done.status).toBe(303);
  return account.id;
}

describe('a confirmed transfer after SIGKILL', () => {
  it('is still there after a restart, with its balance moved and its idempotent replay', async () => {
    const port = await freePort();
    const first = await start(port);
    const stripe = client(port);
    const destination = await onboarded(port, stripe);
    const topUp = await fetch(`http://127.0.0.1:${port}/_control/balance`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ amount: 10_000, currency: 'usd' }),
    });
    expect(topUp.status).toBe(200);
    const key = randomUUID();
    const transfer = await stripe.transfers.create(
      { amount: 1234, currency: 'usd', destination, metadata: { payoutId: key } },
      { idempotencyKey: key },
    );
    // Killed the moment the answer is in: no shutdown write, no delayed save.
    await stop(first, 'SIGKILL');

    await start(port);
    const again = client(port);
    const kept = await again.transfers.retrieve(transfer.id);
    expect(kept).toMatchObject({ id: transfer.id, amount: 1234, destination, metadata: { payoutId: key } });
    const replay = await again.transfers.create(
      { amount: 1234, currency: 'usd', destination, metadata: { payoutId: key } },
      { idempotencyKey: key },
    );
    expect(replay.id).toBe(transfer.id);
    expect(replay.lastResponse.headers['idempotent-replayed']).toBe('true');
    const balance = await again.balance.retrieve({}, { stripeAccount: destination });
    expect(balance.available.find((entry) => entry.currency === 'usd')?.amount).toBe(1234);
  });

  it('keeps every one of many transfers confirmed side by side before the kill', async () => {
    const port = await freePort();
    const first = await start(port);
    const stripe = client(port);
    const destination = await onboarded(port, stripe);
    await fetch(`http://127.0.0.1:${port}/_control/balance`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ amount: 100_000, currency: 'usd' }),
    });
    const confirmed = await Promise.all(
      Array.from({ length: 20 }, (_, i) =>
        stripe.transfers.create(
          { amount: 100 + i, currency: 'usd', destination, transfer_group: 'crash' },
          { idempotencyKey: randomUUID() },
        ),
      ),
    );
    await stop(first, 'SIGKILL');

    await start(port);
    const kept = await client(port).transfers.list({ transfer_group: 'crash', limit: 100 });
    expect(kept.data.map((t) => t.id).sort()).toEqual(confirmed.map((t) => t.id).sort());
  });
});
