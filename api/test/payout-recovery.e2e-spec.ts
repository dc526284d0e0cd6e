// Money that survives failure: payouts through provider outages end paid or failed-and-retryable, payouts left
// `sending` are settled by asking the provider, funding says plainly when the provider is down, and webhooks are
// applied in the provider's order per object, inside the signature's time window, and refused by field when malformed.
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { expectStatus } from './support/http';
import {
  eventually,
  fund,
  onboard,
  owedPayouts,
  payoutStatuses,
  providerClient,
  providerFaults,
  studyWithParticipant,
  WEBHOOK_SECRET,
} from './support/payout-fixtures';
import { Browser, draftBetweenStudy, signedInStaff } from './support/study-fixtures';
import { startTestApp, TestApp } from './support/test-app';

// The api listens where the payments stand-in delivers its webhooks (npm test points it at this port).
const WEBHOOK_PORT = Number(process.env.PAYMENTS_WEBHOOK_PORT ?? 3110);

let testApp: TestApp;
let coordinator: Browser;
let provider: Stripe;

beforeAll(async () => {
  // Short, capped retries: eight of them take seconds here, as they take minutes in production.
  testApp = await startTestApp({ JOB_RETRY_DELAY_SECONDS: '1', JOB_RETRY_DELAY_MAX_SECONDS: '2' });
  await testApp.app.listen(WEBHOOK_PORT, '127.0.0.1');
  coordinator = await signedInStaff(testApp, 'coordinator');
  provider = providerClient();
  await providerFaults();
});
afterAll(async () => {
  await providerFaults();
  await testApp.close();
});

async function providerAccountOf(enrollmentId: string): Promise<string> {
  const [row] = await testApp.dataSource.query(
    `SELECT a.provider_account_id FROM payout_account a JOIN enrollment e ON e.participant_id = a.user_id WHERE e.id = $1`,
    [enrollmentId],
  );
  return row.provider_account_id;
}

describe('payouts through a provider outage', () => {
  it('ends every payout failed with the reason and its amount released when the outage outlasts the retries, then pays each once on retry', async () => {
    const { studyId, browser, enrollmentId } = await studyWithParticipant(testApp, coordinator, 'outage');
    await onboard(browser);
    await fund(coordinator, provider, studyId, 10_000);
    const ids = await owedPayouts(testApp, studyId, enrollmentId, 10);
    // Every call fails for far longer than ten payouts' nine tries each (three requests a try with the SDK's own retries).
    await providerFaults({ failNext: { status: 500, count: 1000 } });
    try {
      await expectStatus(coordinator.post(`/api/studies/${studyId}/payouts/approve`).send({ payoutIds: ids }), 200);
      const failed = await eventually(
        async () => {
          const rows = await payoutStatuses(testApp, studyId);
          return rows.every((r) => r.status === 'failed') && rows;
        },
        'every payout failed once its tries ran out',
        240_000,
      );
      for (const row of failed) expect(row.failure_reason).toMatch(/tries/);
      const budget = await expectStatus(coordinator.get(`/api/studies/${studyId}/budget`), 200);
      expect(budget).toMatchObject({ fundedMinor: 10_000, committedMinor: 0, paidMinor: 0, remainingMinor: 10_000 });
    } finally {
      await providerFaults();
    }
    for (const id of ids) await expectStatus(coordinator.post(`/api/payouts/${id}/retry`), 200);
    await eventually(
      async () => (await payoutStatuses(testApp, studyId)).every((r) => r.status === 'paid'),
      'every payout paid after the retry',
      120_000,
    );
    // A paid payout cannot be sent again: its own code, so a screen can say so without reading the sentence.
    await expectStatus(coordinator.post(`/api/payouts/${ids[0]}/retry`), 409, 'PAYOUT_NOT_RETRYABLE');
    const transfers = await provider.transfers.list({ transfer_group: `study_${studyId}`, limit: 100 });
    expect(transfers.data).toHaveLength(10);
    expect(new Set(transfers.data.map((t) => t.metadata?.payoutId))).toEqual(new Set(ids));
    const reconciliation = await expectStatus(coordinator.get(`/api/studies/${studyId}/payouts/reconciliation`), 200);
    expect(reconciliation).toMatchObject({ differences: [], ledgerPaidCount: 10, providerTransferCount: 10 });
  }, 420_000);

  it('pays everything without anyone stepping in when the outage ends within the retries', async () => {
    const { studyId, browser, enrollmentId } = await studyWithParticipant(testApp, coordinator, 'blip');
    await onboard(browser);
    await fund(coordinator, provider, studyId, 10_000);
    const ids = await owedPayouts(testApp, studyId, enrollmentId, 5);
    // Fewer failures than five payouts' tries: each payout sees some of them and then gets through.
    await providerFaults({ failNext: { status: 500, count: 30 } });
    try {
      await expectStatus(coordinator.post(`/api/studies/${studyId}/payouts/approve`).send({ payoutIds: ids }), 200);
      await eventually(
        async () => (await payoutStatuses(testApp, studyId)).every((r) => r.status === 'paid'),
        'every payout paid',
        240_000,
      );
    } finally {
      await providerFaults();
    }
    const transfers = await provider.transfers.list({ transfer_group: `study_${studyId}`, limit: 100 });
    expect(transfers.data).toHaveLength(5);
  }, 300_000);
});

describe('the sweeper', () => {
  it('settles payouts left sending by asking the provider: paid once when the transfer exists, failed and retryable when it does not', async () => {
    const { PayoutRecoveryService } = await import('../src/payouts/payout-recovery.service');
    const { studyId, browser, enrollmentId } = await studyWithParticipant(testApp, coordinator, 'sweep');
    await onboard(browser);
    await fund(coordinator, provider, studyId, 10_000);
    const [reached, lost] = await owedPayouts(testApp, studyId, enrollmentId, 2);
    const destination = await providerAccountOf(enrollmentId);
    // Webhooks held back, so only the sweeper's own question to the provider can settle these two.
    await providerFaults({ webhook: { delayMs: 120_000 } });
    try {
      // A sender that reached the provider and died before recording it, and one that died before sending.
      const transfer = await provider.transfers.create(
        {
          amount: 100,
          currency: 'usd',
          destination,
          transfer_group: `study_${studyId}`,
          metadata: { payoutId: reached, studyId },
        },
        { idempotencyKey: reached },
      );
      await testApp.dataSource.query(
        `UPDATE payout SET status = 'sending', attempts = 1, approved_at = now() - interval '10 minutes', sent_at = now() - interval '10 minutes',
                updated_at = now() - interval '10 minutes' WHERE id = ANY($1::uuid[])`,
        [[reached, lost]],
      );
      expect((await expectStatus(coordinator.get(`/api/studies/${studyId}/budget`), 200)).committedMinor).toBe(200);
      await testApp.app.get(PayoutRecoveryService).sweep();
      const rows = new Map((await payoutStatuses(testApp, studyId)).map((r) => [r.id, r]));
      expect(rows.get(reached)).toMatchObject({ status: 'paid', provider_transfer_id: transfer.id });
      expect(rows.get(lost)).toMatchObject({ status: 'failed', provider_transfer_id: null });
      expect(rows.get(lost)!.failure_reason).toMatch(/no transfer/i);
      expect(await expectStatus(coordinator.get(`/api/studies/${studyId}/budget`), 200)).toMatchObject({
        committedMinor: 0,
        paidMinor: 100,
      });
      // Sweeping again changes nothing.
      await testApp.app.get(PayoutRecoveryService).sweep();
      expect((await payoutStatuses(testApp, studyId)).map((r) => r.status).sort()).toEqual(['failed', 'paid']);
    } finally {
      await providerFaults();
    }
    await expectStatus(coordinator.post(`/api/payouts/${lost}/retry`), 200);
    await eventually(
      async () => (await payoutStatuses(testApp, studyId)).every((r) => r.status === 'paid'),
      'the retried payout paid',
    );
    const transfers = await provider.transfers.list({ transfer_group: `study_${studyId}`, limit: 100 });
    expect(transfers.data.map((t) => t.metadata?.payoutId).sort()).toEqual([reached, lost].sort());
    const reconciliation = await expectStatus(coordinator.get(`/api/studies/${studyId}/payouts/reconciliation`), 200);
    expect(reconciliation).toMatchObject({ differences: [], ledgerPaidCount: 2, providerTransferCount: 2 });
  }, 180_000);

  it('runs on a schedule in the job queue', async () => {
    const rows: Array<{ cron: string }> = await testApp.dataSource.query(
      `SELECT cron FROM job_queue.schedule WHERE name = 'payout.sweep'`,
    );
    expect(rows).toHaveLength(1);
  });
});

describe('funding while the provider is down', () => {
  it('answers 503 PROVIDER_UNAVAILABLE and records nothing, then works once the provider is back', async () => {
    const { studyId } = await draftBetweenStudy(coordinator);
    await providerFaults({ failNext: { status: 500, count: 100 } });
    try {
      const problem = await expectStatus(
        coordinator.post(`/api/studies/${studyId}/funding`).send({ amountMinor: 5000 }),
        503,
        'PROVIDER_UNAVAILABLE',
      );
      expect(problem.message).toMatch(/payment provider/i);
    } finally {
      await providerFaults();
    }
    expect(await testApp.dataSource.query(`SELECT 1 FROM study_funding WHERE study_id = $1`, [studyId])).toHaveLength(
      0,
    );
    await expectStatus(coordinator.post(`/api/studies/${studyId}/funding`).send({ amountMinor: 5000 }), 201);
  });
});

describe('webhook order, time window and shape', () => {
  const now = () => Math.floor(Date.now() / 1000);

  function post(
    payload: string,
    header = provider.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET }),
  ) {
    return testApp
      .browser()
      .post('/api/webhooks/payments')
      .set('Stripe-Signature', header)
      .set('Content-Type', 'application/json')
      .send(payload);
  }

  function event(id: string, type: string, created: number, object: unknown) {
    return JSON.stringify({
      id,
      object: 'event',
      api_version: '2026-10-28.endive',
      created,
      type,
      livemode: false,
      pending_webhooks: 1,
      request: { id: null, idempotency_key: null },
      data: { object },
    });
  }

  async function payoutsEnabled(accountId: string): Promise<boolean> {
    const [row] = await testApp.dataSource.query(
      `SELECT payouts_enabled FROM payout_account WHERE provider_account_id = $1`,
      [accountId],
    );
    return row.payouts_enabled;
  }

  it('lets a stale account.updated change nothing, and applies a newer one', async () => {
    const { browser, enrollmentId } = await studyWithParticipant(testApp, coordinator, 'stale');
    await onboard(browser);
    const accountId = await providerAccountOf(enrollmentId);
    const current = await provider.accounts.retrieve(accountId);
    const [latest] = (await provider.events.list({ type: 'account.updated', limit: 100 }, { stripeAccount: accountId }))
      .data;
    expect(latest).toBeDefined();
    const switchedOff = {
      ...current,
      payouts_enabled: false,
      details_submitted: false,
      capabilities: { transfers: 'inactive' },
    };

    // Sent before onboarding finished, delivered after: older than what was applied.
    const stale = await expectStatus(
      post(event(`evt_stale_${accountId}`, 'account.updated', latest.created - 60, switchedOff)),
      200,
    );
    expect(stale).toMatchObject({ received: true, duplicate: false });
    expect(await payoutsEnabled(accountId)).toBe(true);
    const [stored] = await testApp.dataSource.query(`SELECT 1 FROM provider_event WHERE provider_event_id = $1`, [
      `evt_stale_${accountId}`,
    ]);
    expect(stored).toBeDefined();

    await expectStatus(post(event(`evt_newer_${accountId}`, 'account.updated', latest.created + 1, switchedOff)), 200);
    expect(await payoutsEnabled(accountId)).toBe(false);
  });

  it('refuses a signature stamped outside five minutes either way, and accepts one inside', async () => {
    const payload = event(`evt_window_${now()}`, 'balance.available', now(), {
      object: 'balance',
      available: [],
      pending: [],
    });
    for (const offset of [400, -400]) {
      const header = provider.webhooks.generateTestHeaderString({
        payload,
        secret: WEBHOOK_SECRET,
        timestamp: now() + offset,
      });
      const refused = await expectStatus(post(payload, header), 400, 'VALIDATION_FAILED');
      expect(refused.errors).toEqual([{ field: 'Stripe-Signature', message: expect.stringMatching(/timestamp/i) }]);
    }
    expect(
      await testApp.dataSource.query(`SELECT 1 FROM provider_event WHERE provider_event_id = $1`, [
        JSON.parse(payload).id,
      ]),
    ).toHaveLength(0);
    const header = provider.webhooks.generateTestHeaderString({
      payload,
      secret: WEBHOOK_SECRET,
      timestamp: now() + 200,
    });
    await expectStatus(post(payload, header), 200);
  });

  it('answers 400 naming what is missing when a correctly signed webhook is malformed, and stores nothing', async () => {
    const cases: Array<[string, string[]]> = [
      ['{}', ['id', 'type', 'created', 'data']],
      [
        JSON.stringify({
          id: 'evt_malformed_null',
          object: 'event',
          type: 'account.updated',
          created: now(),
          data: { object: null },
        }),
        ['data.object'],
      ],
      [
        JSON.stringify({
          id: 'evt_malformed_noid',
          object: 'event',
          type: 'transfer.created',
          created: now(),
          data: { object: { object: 'transfer' } },
        }),
        ['data.object.id'],
      ],
      [
        JSON.stringify({
          id: 'evt_malformed_created',
          object: 'event',
          type: 'account.updated',
          created: 'yesterday',
          data: { object: { id: 'acct_1' } },
        }),
        ['created'],
      ],
      ['[1, 2]', ['body']],
    ];
    for (const [payload, fields] of cases) {
      const problem = await expectStatus(post(payload), 400, 'VALIDATION_FAILED');
      expect(problem.errors.map((e: { field: string }) => e.field)).toEqual(fields);
    }
    // A signed body that is not JSON at all never reaches the webhook: the app's JSON parser refuses it as sent.
    await expectStatus(post('not json at all'), 400);
    expect(
      await testApp.dataSource.query(`SELECT 1 FROM provider_event WHERE provider_event_id LIKE 'evt_malformed_%'`),
    ).toHaveLength(0);
  });
});
