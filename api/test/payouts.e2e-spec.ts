import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PayoutSendingService } from '../src/payouts/payout-sending.service';
import { activeConsentVersion, signedUpParticipant } from './support/consent-fixtures';
import { eventually, openStudyWithCodedSteps } from './support/payout-fixtures';
import { expectStatus } from './support/http';
import { waitForMail } from './support/mailbox';
import { Browser, signedInStaff } from './support/study-fixtures';
import { startTestApp, TestApp } from './support/test-app';

// The api listens where the payments stand-in delivers its webhooks (npm test points it at this port).
const WEBHOOK_PORT = Number(process.env.PAYMENTS_WEBHOOK_PORT ?? 3110);
const PROVIDER_URL = `http://127.0.0.1:${process.env.STRIPE_PORT ?? 3200}`;

let testApp: TestApp;
let coordinator: Browser;
let provider: Stripe;

beforeAll(async () => {
  testApp = await startTestApp({ JOB_RETRY_DELAY_SECONDS: '1' });
  await testApp.app.listen(WEBHOOK_PORT, '127.0.0.1');
  coordinator = await signedInStaff(testApp, 'coordinator');
  provider = new Stripe('sk_test_evenhand_local', {
    host: '127.0.0.1',
    port: Number(process.env.STRIPE_PORT ?? 3200),
    protocol: 'http',
  });
  await fetch(`${PROVIDER_URL}/_control/faults`, { method: 'DELETE' });
});
afterAll(async () => {
  await fetch(`${PROVIDER_URL}/_control/faults`, { method: 'DELETE' });
  await testApp.close();
});

/** A recruiting study with two coded steps, and a participant who has signed and set up payouts. */
async function paidStudyWithParticipant() {
  const { studyId, version } = await openStudyWithCodedSteps(coordinator, [
    ['Session 1', 1000, 'ONE-1111'],
    ['Session 2', 1500, 'TWO-2222'],
  ]);
  const { browser, email, me } = await signedUpParticipant(testApp, studyId, version, 'payee', 'Pat Payee');
  const steps = me.steps;
  expect(steps.map((s: { hasCompletionCode: boolean }) => s.hasCompletionCode)).toEqual([true, true]);
  return { studyId, browser, email, steps: steps as Array<{ id: string; title: string }> };
}

async function onboard(browser: Browser) {
  const { url } = await expectStatus(browser.post('/api/me/payout-account'), 200);
  const page = await (await fetch(url)).text();
  const action = new URL(/<form[^>]*action="([^"]+)"/.exec(page)![1], url).toString();
  const done = await fetch(action, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'Content-Type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ full_name: 'Pat Payee', confirmed: 'yes', action: 'complete' }).toString(),
  });
  expect(done.status).toBe(303);
  expect(done.headers.get('location')).toContain('/payouts?onboarding=done');
  await eventually(
    async () => (await expectStatus(browser.get('/api/me/payout-account'), 200)).payoutsEnabled,
    'payouts enabled',
  );
}

/** Funds the study as the admin's card form does: a payment intent confirmed with a test card. */
async function fund(studyId: string, amountMinor: number) {
  const intent = await expectStatus(coordinator.post(`/api/studies/${studyId}/funding`).send({ amountMinor }), 201);
  const paymentIntentId = intent.clientSecret.split('_secret_')[0];
  await provider.paymentIntents.confirm(paymentIntentId, { payment_method: 'pm_card_visa' });
  await eventually(
    async () => (await expectStatus(coordinator.get(`/api/studies/${studyId}/budget`), 200)).fundedMinor >= amountMinor,
    'funding',
  );
}

describe('completing steps', () => {
  it('owes the step pay for a correct code, refuses a wrong one by field, and limits guessing', async () => {
    const { studyId, browser, steps } = await paidStudyWithParticipant();
    const wrong = await expectStatus(
      browser.post(`/api/studies/${studyId}/enrollments/me/steps/${steps[0].id}/complete`).send({ code: 'nope' }),
      400,
      'VALIDATION_FAILED',
    );
    expect(wrong.errors[0].field).toBe('code');
    const done = await expectStatus(
      browser.post(`/api/studies/${studyId}/enrollments/me/steps/${steps[0].id}/complete`).send({ code: ' one-1111 ' }),
      200,
    );
    expect(done).toMatchObject({
      status: 'active',
      earned: { earnedMinor: 1000, paidMinor: 0, stillToBePaidMinor: 1000 },
    });
    expect(done.steps[0]).toMatchObject({ status: 'done' });
    // Completing the same step again owes nothing more.
    await expectStatus(
      browser.post(`/api/studies/${studyId}/enrollments/me/steps/${steps[0].id}/complete`).send({ code: 'ONE-1111' }),
      200,
    );
    // One wrong code above, four more here: the fifth wrong code in 15 minutes is the last one allowed.
    for (let i = 0; i < 4; i++)
      await expectStatus(
        browser.post(`/api/studies/${studyId}/enrollments/me/steps/${steps[1].id}/complete`).send({ code: `bad-${i}` }),
        400,
      );
    await expectStatus(
      browser.post(`/api/studies/${studyId}/enrollments/me/steps/${steps[1].id}/complete`).send({ code: 'TWO-2222' }),
      429,
      'RATE_LIMITED',
    );
    const queue = await expectStatus(coordinator.get(`/api/studies/${studyId}/payouts`), 200);
    expect(queue.items.map((p: { amountMinor: number; status: string }) => [p.amountMinor, p.status])).toEqual([
      [1000, 'owed'],
    ]);
  });

  it('lets staff check a step off, and blocks the next step until a new consent version is signed', async () => {
    const { studyId, browser, steps } = await paidStudyWithParticipant();
    const me = await expectStatus(browser.get(`/api/studies/${studyId}/enrollments/me`), 200);
    await expectStatus(
      coordinator.post(`/api/studies/${studyId}/enrollments/${me.id}/steps/${steps[0].id}/complete`),
      200,
    );
    await activeConsentVersion(coordinator, studyId, 'HLREB-2026-031-A2');
    const blocked = await expectStatus(
      browser.post(`/api/studies/${studyId}/enrollments/me/steps/${steps[1].id}/complete`).send({ code: 'TWO-2222' }),
      409,
      'CONSENT_VERSION_STALE',
    );
    expect(blocked.currentVersion.versionId).toBeDefined();
  });
});

describe('paying', () => {
  it('pays an approved payout once after onboarding and funding, with a receipt, and reconciles', async () => {
    const { studyId, browser, email, steps } = await paidStudyWithParticipant();
    await expectStatus(
      browser.post(`/api/studies/${studyId}/enrollments/me/steps/${steps[0].id}/complete`).send({ code: 'ONE-1111' }),
      200,
    );
    const [owed] = (await expectStatus(coordinator.get(`/api/studies/${studyId}/payouts`), 200)).items;
    // Nothing is funded yet: the budget guard refuses.
    const refused = await expectStatus(
      coordinator.post(`/api/studies/${studyId}/payouts/approve`).send({ payoutIds: [owed.id] }),
      409,
      'BALANCE_TOO_LOW',
    );
    expect(refused.remainingMinor).toBe(0);
    await onboard(browser);
    await fund(studyId, 50_000);
    const approved = await expectStatus(
      coordinator.post(`/api/studies/${studyId}/payouts/approve`).send({ payoutIds: [owed.id] }),
      200,
    );
    expect(approved).toMatchObject({ approved: 1, amountMinor: 1000, remainingMinor: 49_000 });
    await expectStatus(coordinator.post(`/api/studies/${studyId}/payouts/approve`).send({ payoutIds: [owed.id] }), 409);
    const paid = await eventually(async () => {
      const [p] = (await expectStatus(coordinator.get(`/api/studies/${studyId}/payouts`), 200)).items;
      return p.status === 'paid' && p;
    }, 'payout paid');
    expect(paid.providerTransferId).toMatch(/^tr_/);
    const receipt = await waitForMail(email, 20_000, /receipt/i);
    expect(paid.receiptNumber).toMatch(/-0001$/);
    expect(receipt.text).toContain(paid.receiptNumber);
    expect(receipt.text).not.toContain(paid.providerTransferId);
    const mine = await expectStatus(browser.get('/api/me/payouts'), 200);
    expect(mine.items[0]).toMatchObject({ status: 'paid', amountMinor: 1000, receipt: paid.receiptNumber });
    const budget = await expectStatus(coordinator.get(`/api/studies/${studyId}/budget`), 200);
    expect(budget).toMatchObject({ fundedMinor: 50_000, paidMinor: 1000, committedMinor: 0, remainingMinor: 49_000 });
    const reconciliation = await expectStatus(coordinator.get(`/api/studies/${studyId}/payouts/reconciliation`), 200);
    expect(reconciliation).toMatchObject({ differences: [], ledgerPaidCount: 1, providerTransferCount: 1 });
    const tax = await expectStatus(coordinator.get(`/api/studies/${studyId}/payouts/tax-threshold`), 200);
    expect(tax).toMatchObject({
      thresholdMinor: 200_000,
      participants: [{ paidThisYearMinor: 1000, standing: 'under' }],
    });
    expect(tax.caution).toMatch(/finance office/);
  });

  it('makes one transfer when the job crashes after the provider created it but before we recorded it', async () => {
    const { studyId, browser, steps } = await paidStudyWithParticipant();
    await expectStatus(
      browser.post(`/api/studies/${studyId}/enrollments/me/steps/${steps[0].id}/complete`).send({ code: 'ONE-1111' }),
      200,
    );
    await onboard(browser);
    await fund(studyId, 10_000);
    const [owed] = (await expectStatus(coordinator.get(`/api/studies/${studyId}/payouts`), 200)).items;
    const payouts = testApp.app.get(PayoutSendingService);
    let crashes = 0;
    payouts.afterTransferCreated = (id) => {
      if (id === owed.id && crashes++ === 0) throw new Error('simulated crash between sending and recording');
    };
    try {
      await expectStatus(
        coordinator.post(`/api/studies/${studyId}/payouts/approve`).send({ payoutIds: [owed.id] }),
        200,
      );
      await eventually(
        async () =>
          (await expectStatus(coordinator.get(`/api/studies/${studyId}/payouts`), 200)).items[0].status === 'paid',
        'paid after crash',
      );
    } finally {
      payouts.afterTransferCreated = null;
    }
    expect(crashes).toBeGreaterThanOrEqual(1);
    const transfers = await provider.transfers.list({ transfer_group: `study_${studyId}`, limit: 100 });
    expect(transfers.data).toHaveLength(1);
  });

  it('pays 500 payouts exactly once through injected errors and duplicated webhooks, and reconciles to zero difference', async () => {
    const { studyId, browser } = await paidStudyWithParticipant();
    await onboard(browser);
    await fund(studyId, 500 * 100);
    const me = await expectStatus(browser.get(`/api/studies/${studyId}/enrollments/me`), 200);
    const [{ participant_id: participantId }] = await testApp.dataSource.query(
      `SELECT participant_id FROM enrollment WHERE id = $1`,
      [me.id],
    );
    await testApp.dataSource.query(
      `INSERT INTO payout (id, study_id, enrollment_id, participant_id, kind, amount_minor, currency, idempotency_key)
       SELECT g.id, $1, $2, $3, 'step', 100, 'USD', g.id::text FROM (SELECT gen_random_uuid() AS id FROM generate_series(1, 500)) g`,
      [studyId, me.id, participantId],
    );
    const ids = (await testApp.dataSource.query(`SELECT id FROM payout WHERE study_id = $1`, [studyId])).map(
      (r: { id: string }) => r.id,
    );
    // 25 server errors (5 % of 500 sends) and every webhook delivered twice.
    await fetch(`${PROVIDER_URL}/_control/faults`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ failNext: { status: 500, count: 25 }, webhook: { duplicate: true } }),
    });
    try {
      await expectStatus(coordinator.post(`/api/studies/${studyId}/payouts/approve`).send({ payoutIds: ids }), 200);
      await eventually(
        async () => {
          const [{ n }] = await testApp.dataSource.query(
            `SELECT count(*) AS n FROM payout WHERE study_id = $1 AND status = 'paid'`,
            [studyId],
          );
          return Number(n) === 500;
        },
        '500 payouts paid',
        240_000,
      );
    } finally {
      await fetch(`${PROVIDER_URL}/_control/faults`, { method: 'DELETE' });
    }
    const transfers = await provider.transfers
      .list({ transfer_group: `study_${studyId}`, limit: 100 })
      .autoPagingToArray({ limit: 10_000 });
    expect(transfers).toHaveLength(500);
    expect(new Set(transfers.map((t) => t.metadata?.payoutId)).size).toBe(500);
    const reconciliation = await expectStatus(coordinator.get(`/api/studies/${studyId}/payouts/reconciliation`), 200);
    expect(reconciliation).toMatchObject({
      differences: [],
      ledgerPaidCount: 500,
      ledgerPaidMinor: 50_000,
      providerTransferMinor: 50_000,
    });
  }, 300_000);
});

describe('webhooks', () => {
  const secret = 'whsec_evenhand_dev';

  function signed(payload: string, key = secret) {
    return provider.webhooks.generateTestHeaderString({ payload, secret: key });
  }

  it('refuses a bad signature and changes nothing', async () => {
    const payload = JSON.stringify({
      id: 'evt_forged_1',
      object: 'event',
      type: 'payment_intent.succeeded',
      created: Math.floor(Date.now() / 1000),
      data: { object: { id: 'pi_forged' } },
    });
    await expectStatus(
      testApp
        .browser()
        .post('/api/webhooks/payments')
        .set('Stripe-Signature', signed(payload, 'whsec_wrong'))
        .set('Content-Type', 'application/json')
        .send(payload),
      400,
      'VALIDATION_FAILED',
    );
    const rows = await testApp.dataSource.query(
      `SELECT 1 FROM provider_event WHERE provider_event_id = 'evt_forged_1'`,
    );
    expect(rows).toHaveLength(0);
  });

  it('treats a duplicate as a no-op and turns a reversed transfer into a reversed payout owed again', async () => {
    const { studyId, browser, steps } = await paidStudyWithParticipant();
    await expectStatus(
      browser.post(`/api/studies/${studyId}/enrollments/me/steps/${steps[0].id}/complete`).send({ code: 'ONE-1111' }),
      200,
    );
    await onboard(browser);
    await fund(studyId, 10_000);
    const [owed] = (await expectStatus(coordinator.get(`/api/studies/${studyId}/payouts`), 200)).items;
    await expectStatus(coordinator.post(`/api/studies/${studyId}/payouts/approve`).send({ payoutIds: [owed.id] }), 200);
    const paid = await eventually(async () => {
      const [p] = (
        await expectStatus(coordinator.get(`/api/studies/${studyId}/payouts`).query({ status: 'paid' }), 200)
      ).items;
      return p;
    }, 'paid');
    await provider.transfers.createReversal(paid.providerTransferId);
    const reversed = await eventually(async () => {
      const list = (await expectStatus(coordinator.get(`/api/studies/${studyId}/payouts`), 200)).items;
      return list.length === 2 && list;
    }, 'reversal applied');
    expect(reversed.map((p: { status: string }) => p.status).sort()).toEqual(['owed', 'reversed']);

    // Replaying the very same event changes nothing.
    const [event] = await testApp.dataSource.query(
      `SELECT payload FROM provider_event WHERE type = 'transfer.reversed' ORDER BY received_at DESC LIMIT 1`,
    );
    const payload = JSON.stringify(event.payload);
    const again = await expectStatus(
      testApp
        .browser()
        .post('/api/webhooks/payments')
        .set('Stripe-Signature', signed(payload))
        .set('Content-Type', 'application/json')
        .send(payload),
      200,
    );
    expect(again).toEqual({ received: true, duplicate: true });
    expect((await expectStatus(coordinator.get(`/api/studies/${studyId}/payouts`), 200)).items).toHaveLength(2);
  });
});
