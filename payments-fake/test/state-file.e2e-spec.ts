// Keeping the stand-in's state across restarts (PAYMENTS_FAKE_STATE_FILE), driven through the
// official SDK. What a restart must not change is the provider's published behaviour:
//   lists newest first, cursor pagination   https://docs.stripe.com/api/pagination
//   idempotent replays, idempotency_error   https://docs.stripe.com/api/idempotent_requests
//   balance available / pending             https://docs.stripe.com/api/balance/balance_object
//   undelivered events are retried          https://docs.stripe.com/webhooks#retries
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import Stripe from 'stripe';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { startPaymentsFake } from '../src/app/payments-fake-app';
import { StateFileError } from '../src/state/state-file';
import type { WorldSnapshot } from '../src/state/world-snapshot';
import { onboardedAccount, startHarness, startWebhookReceiver, waitFor, WEBHOOK_SECRET } from './support/harness';
import { caught } from './support/caught';

// Temporary files stay under the repository's git-ignored .local folder.
const TEMP_ROOT = path.resolve(__dirname, '../../.local/tmp');
const REFRESH_URL = 'http://127.0.0.1:5173/payout-setup/refresh';
const RETURN_URL = 'http://127.0.0.1:5173/payout-setup/done';

let folder: string;
let file: string;

beforeEach(() => {
  mkdirSync(TEMP_ROOT, { recursive: true });
  folder = mkdtempSync(path.join(TEMP_ROOT, 'payments-fake-state-'));
  file = path.join(folder, 'payments-state.json');
});
afterEach(() => {
  rmSync(folder, { recursive: true, force: true });
});

function readSnapshot(): WorldSnapshot {
  return JSON.parse(readFileSync(file, 'utf8')) as WorldSnapshot;
}

/** Polls the state file until `check` holds for its content. */
async function waitForSnapshot(check: (snapshot: WorldSnapshot) => boolean, what: string): Promise<WorldSnapshot> {
  let last: WorldSnapshot | undefined;
  await waitFor(
    () => {
      if (!existsSync(file)) return false;
      last = readSnapshot();
      return check(last);
    },
    10_000,
    what,
  );
  return last as WorldSnapshot;
}

/** Everything a caller can read back through the SDK, each list in full. */
async function readEverything(
  client: Stripe,
  ids: { participant: string; transfer: string; reversal: string; payout: string; intent: string },
) {
  const all = { limit: 100 };
  const asParticipant = { stripeAccount: ids.participant };
  return {
    platform: await client.accounts.retrieveCurrent(),
    accounts: await client.accounts.list(all),
    participant: await client.accounts.retrieve(ids.participant),
    transfers: await client.transfers.list(all),
    transfer: await client.transfers.retrieve(ids.transfer),
    reversals: await client.transfers.listReversals(ids.transfer, all),
    reversal: await client.transfers.retrieveReversal(ids.transfer, ids.reversal),
    payouts: await client.payouts.list(all),
    payout: await client.payouts.retrieve(ids.payout),
    participantPayouts: await client.payouts.list(all, asParticipant),
    paymentIntents: await client.paymentIntents.list(all),
    paymentIntent: await client.paymentIntents.retrieve(ids.intent),
    balance: await client.balance.retrieve(),
    participantBalance: await client.balance.retrieve({}, asParticipant),
    events: await client.events.list(all),
    participantEvents: await client.events.list(all, asParticipant),
  };
}

describe('state file', () => {
  it('brings back every object, the balance, idempotency keys and events after a restart', async () => {
    const receiver = await startWebhookReceiver();
    // Card money stays pending for 60 s; payouts stay pending for the whole test.
    const settings = { stateFile: file, fundsPendingMs: 60_000, payoutSettleMs: 60_000 };
    const first = await startHarness(settings, { receiver });
    const stripe = first.stripe();

    const participant = await onboardedAccount(first, stripe);
    await stripe.accounts.update(participant.id, { metadata: { participant: 'p101' } });
    const other = await stripe.accounts.create({ type: 'express', email: 'p102@evenhand.test' });
    const openLink = await stripe.accountLinks.create({
      account: other.id,
      type: 'account_onboarding',
      refresh_url: REFRESH_URL,
      return_url: RETURN_URL,
    });

    const topUp = await stripe.paymentIntents.create({
      amount: 50_000,
      currency: 'usd',
      description: 'Fund study: Wayfinding cues',
    });
    await stripe.paymentIntents.confirm(topUp.id, { payment_method: 'pm_card_visa' });
    await first.control('/settle');

    const transferParams: Stripe.TransferCreateParams = {
      amount: 10_000,
      currency: 'usd',
      destination: participant.id,
      metadata: { payout: 'payout-101' },
    };
    const keyed = await stripe.transfers.create(transferParams, { idempotencyKey: 'payout-101' });
    await stripe.transfers.create({ amount: 5_000, currency: 'usd', destination: participant.id });
    const reversal = await stripe.transfers.createReversal(keyed.id, {
      amount: 2_000,
      metadata: { reason: 'overpaid' },
    });
    const payout = await stripe.payouts.create({ amount: 3_000, currency: 'usd' });
    await stripe.payouts.create({ amount: 1_000, currency: 'usd' }, { stripeAccount: participant.id });
    // A second top-up stays pending; half of its pending time passes on the stand-in's clock.
    await stripe.paymentIntents.create({
      amount: 20_000,
      currency: 'usd',
      payment_method: 'pm_card_visa',
      confirm: true,
    });
    await first.control('/clock', { advanceSeconds: 30 });

    await first.fake.world.dispatcher.idle();
    const ids = {
      participant: participant.id,
      transfer: keyed.id,
      reversal: reversal.id,
      payout: payout.id,
      intent: topUp.id,
    };
    const before = await readEverything(stripe, ids);
    // 50 000 topped up − 10 000 − 5 000 transferred + 2 000 reversed − 3 000 paid out; 20 000 pending.
    expect(before.balance.available).toEqual([{ amount: 34_000, currency: 'usd' }]);
    expect(before.balance.pending).toEqual([{ amount: 20_000, currency: 'usd' }]);
    expect(before.participantBalance.available).toEqual([{ amount: 12_000, currency: 'usd' }]);
    expect(before.accounts.data.map((account) => account.id)).toEqual([other.id, participant.id]);
    expect(before.events.data.length).toBeGreaterThan(8);
    await first.close();

    const saved = readSnapshot();
    expect(saved).toMatchObject({
      format: 'evenhand-payments-fake-state',
      version: 1,
      platformAccountId: before.platform.id,
    });
    expect(Number.isNaN(Date.parse(saved.savedAt))).toBe(false);
    expect(JSON.stringify(saved)).not.toContain('sk_test_');

    const second = await startHarness(settings, { receiver });
    try {
      expect(second.fake.restoredSavedAt).toBe(saved.savedAt);
      const client = second.stripe();
      const after = await readEverything(client, ids);
      expect(after).toEqual(before);
      expect(after.platform.id).toBe(before.platform.id);

      // The same key and parameters replay the first answer; other parameters are refused.
      const replayed = await client.transfers.create(transferParams, { idempotencyKey: 'payout-101' });
      expect(replayed).toEqual(keyed);
      expect(replayed.lastResponse.headers['idempotent-replayed']).toBe('true');
      expect(replayed.lastResponse.headers['original-request']).toBe(keyed.lastResponse.requestId);
      expect((await client.balance.retrieve()).available).toEqual(before.balance.available);
      const mismatch = await caught(
        client.transfers.create({ ...transferParams, amount: 10_001 }, { idempotencyKey: 'payout-101' }),
      );
      expect(mismatch).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
      expect(mismatch.message).toContain('payout-101');

      // New objects get fresh ids and go on top of the restored ones.
      const newTransfer = await client.transfers.create({ amount: 100, currency: 'usd', destination: participant.id });
      const newAccount = await client.accounts.create({ type: 'express', email: 'p103@evenhand.test' });
      expect((await client.transfers.list({ limit: 100 })).data.map((t) => t.id)).toEqual([
        newTransfer.id,
        ...before.transfers.data.map((t) => t.id),
      ]);
      expect((await client.accounts.list({ limit: 100 })).data.map((a) => a.id)).toEqual([
        newAccount.id,
        ...before.accounts.data.map((a) => a.id),
      ]);
      const events = await client.events.list({ limit: 100 });
      expect(events.data.slice(1)).toEqual(before.events.data);
      expect(events.data[0]?.type).toBe('transfer.created');

      // The unused account link still opens its hosted page on the new server.
      const token = new URL(openLink.url).pathname.split('/').pop();
      const page = await fetch(`${second.fake.url}/onboarding/${token}`);
      expect(page.status).toBe(200);
      expect(await page.text()).toContain('p102@evenhand.test');

      // The clock keeps its 30 s lead, and the pending top-up keeps its release time: 31 s more releases it.
      const now = await second.control('/clock', { advanceSeconds: 0 });
      expect(now.body.now).toBeGreaterThanOrEqual(Math.floor(Date.now() / 1000) + 29);
      await second.control('/clock', { advanceSeconds: 31 });
      const released = await client.balance.retrieve();
      expect(released.available).toEqual([{ amount: 34_000 - 100 + 20_000, currency: 'usd' }]);
      expect(released.pending).toEqual([{ amount: 0, currency: 'usd' }]);

      // What happened after the restart is in the file too.
      await waitForSnapshot(
        (snapshot) => snapshot.accounts.some((a) => a.id === newAccount.id),
        'the new account in the file',
      );
    } finally {
      await second.close();
      await receiver.close();
    }
  });

  it('starts empty when there is no file, and writes one after the first change', async () => {
    const harness = await startHarness({ stateFile: file, webhookUrl: null });
    try {
      expect(harness.fake.restoredSavedAt).toBeNull();
      expect(existsSync(file)).toBe(false);
      const client = harness.stripe();
      const platform = await client.accounts.retrieveCurrent();
      const account = await client.accounts.create({ type: 'express', email: 'p104@evenhand.test' });
      const snapshot = await waitForSnapshot(
        (s) => s.accounts.some((a) => a.id === account.id),
        'the account in the file',
      );
      expect(snapshot).toMatchObject({
        format: 'evenhand-payments-fake-state',
        version: 1,
        platformAccountId: platform.id,
      });
      // Written by rename from a temporary file in the same folder, which is gone afterwards.
      expect(readdirSync(folder)).toEqual(['payments-state.json']);
    } finally {
      await harness.close();
    }
  });

  it('empties the file on reset, before the reset answers, keeping the platform account', async () => {
    const first = await startHarness({ stateFile: file, webhookUrl: null });
    const client = first.stripe();
    const platform = await client.accounts.retrieveCurrent();
    const account = await client.accounts.create({ type: 'express' });
    await first.control('/balance', { amount: 5_000, currency: 'usd' });
    await waitForSnapshot(
      (s) => s.accounts.length === 1 && s.ledger.available.length === 1,
      'the account and balance in the file',
    );

    expect((await first.control('/reset')).status).toBe(200);
    const emptied = readSnapshot();
    expect(emptied).toMatchObject({
      platformAccountId: platform.id,
      accounts: [],
      events: [],
      transfers: [],
      payouts: [],
      paymentIntents: [],
      idempotency: [],
      ledger: { available: [], pending: [] },
    });
    await first.close();

    const second = await startHarness({ stateFile: file, webhookUrl: null });
    try {
      const again = second.stripe();
      expect((await again.accounts.list()).data).toEqual([]);
      expect((await again.accounts.retrieveCurrent()).id).toBe(platform.id);
      const gone = await caught(again.accounts.retrieve(account.id));
      expect(gone.statusCode).toBe(403);
      expect((await again.balance.retrieve()).available).toEqual([{ amount: 0, currency: 'usd' }]);
    } finally {
      await second.close();
    }
  });

  it('refuses to start on a file that is not a version 1 snapshot, naming the file, and leaves it alone', async () => {
    // A real snapshot to spoil.
    const maker = await startHarness({ stateFile: file, webhookUrl: null });
    await maker.control('/balance', { amount: 5_000, currency: 'usd' });
    await maker.close();
    const good = readSnapshot();
    expect(good.ledger.available).toHaveLength(1);

    const spoiled = structuredClone(good) as any;
    spoiled.ledger.available[0].amount = 'lots';
    const cases: Array<[string, RegExp]> = [
      ['{"format": "evenhand-payments-fake-state", "version": 1,', /is not valid JSON/],
      ['', /is not valid JSON \(the file is empty\)/],
      ['{"hello": "world"}', /format: must be 'evenhand-payments-fake-state'/],
      [JSON.stringify({ ...good, version: 2 }), /version: must be 1 .*found 2/],
      [JSON.stringify(spoiled), /ledger\.available\[0\]\.amount: must be an integer, found 'lots'/],
      [JSON.stringify({ ...good, extra: true }), /extra: is not a field of version 1/],
    ];
    for (const [content, problem] of cases) {
      writeFileSync(file, content);
      const refusal = await caught(
        startPaymentsFake({
          host: '127.0.0.1',
          port: 0,
          webhookUrl: null,
          webhookSecret: WEBHOOK_SECRET,
          stateFile: file,
        }),
      );
      expect(refusal).toBeInstanceOf(StateFileError);
      expect(refusal.message).toContain(`state file ${file} `);
      expect(refusal.message).toMatch(problem);
      expect(readFileSync(file, 'utf8')).toBe(content);
    }
  });

  it('refuses a state file whose folder does not exist', async () => {
    const missing = path.join(folder, 'no-such-folder', 'state.json');
    const refusal = await caught(
      startPaymentsFake({
        host: '127.0.0.1',
        port: 0,
        webhookUrl: null,
        webhookSecret: WEBHOOK_SECRET,
        stateFile: missing,
      }),
    );
    expect(refusal).toBeInstanceOf(StateFileError);
    expect(refusal.message).toContain(missing);
    expect(refusal.message).toContain('does not exist');
  });

  it('queues events the endpoint had not received again after a restart', async () => {
    const failing = await startWebhookReceiver();
    failing.answerWith(Array(10).fill(500));
    const first = await startHarness({ stateFile: file, webhookRetryDelaysMs: [60_000] }, { receiver: failing });
    const intent = await first.stripe().paymentIntents.create({ amount: 1_000, currency: 'usd' });
    await waitFor(() => first.fake.world.dispatcher.history().length === 1, 10_000, 'the failed first delivery');
    await first.close();
    await failing.close();
    const [event] = readSnapshot().events;
    expect(event).toMatchObject({ type: 'payment_intent.created', pending_webhooks: 1 });

    const working = await startWebhookReceiver();
    const second = await startHarness({ stateFile: file }, { receiver: working });
    try {
      await waitFor(
        () => working.received.some((hook) => hook.eventId === event?.id),
        10_000,
        'the event delivered again',
      );
      await second.fake.world.dispatcher.idle();
      const hook = working.received.find((received) => received.eventId === event?.id);
      const delivered = second.stripe().webhooks.constructEvent(hook!.rawBody, hook!.signature, WEBHOOK_SECRET);
      expect((delivered.data.object as Stripe.PaymentIntent).id).toBe(intent.id);
      expect((await second.stripe().events.retrieve(event!.id)).pending_webhooks).toBe(0);
      const log = await second.control('/webhooks/deliveries', undefined, 'GET');
      expect(log.body.deliveries.map((attempt: { status: number }) => attempt.status)).toEqual([500, 200]);
      await waitForSnapshot((s) => s.events[0]?.pending_webhooks === 0, 'the delivery in the file');
    } finally {
      await second.close();
      await working.close();
    }
  });

  it('releases pending funds and pays pending payouts on their own after a restart', async () => {
    const settings = { stateFile: file, webhookUrl: null, fundsPendingMs: 2_000, payoutSettleMs: 2_000 };
    const first = await startHarness(settings);
    const stripe = first.stripe();
    await first.control('/balance', { amount: 5_000, currency: 'usd' });
    const payout = await stripe.payouts.create({ amount: 2_000, currency: 'usd' });
    await stripe.paymentIntents.create({
      amount: 3_000,
      currency: 'usd',
      payment_method: 'pm_card_visa',
      confirm: true,
    });
    await first.close();
    const saved = readSnapshot();
    expect(saved.payouts[0]?.status).toBe('pending');
    expect(saved.ledger.pending).toHaveLength(1);

    const second = await startHarness(settings);
    try {
      const world = second.fake.world;
      await waitFor(
        () => world.payouts.get(payout.id)?.status === 'paid' && world.ledger.nextReleaseMs() === undefined,
        10_000,
        'the payout paid and the funds released',
      );
      const client = second.stripe();
      expect((await client.payouts.retrieve(payout.id)).status).toBe('paid');
      expect((await client.balance.retrieve()).available).toEqual([{ amount: 5_000 - 2_000 + 3_000, currency: 'usd' }]);
      const types = (await client.events.list({ limit: 100 })).data.map((e) => e.type);
      expect(types).toContain('payout.paid');
      expect(types).toContain('balance.available');
    } finally {
      await second.close();
    }
  });
});
