import type Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signedUpParticipant } from './support/consent-fixtures';
import { expectStatus } from './support/http';
import { waitForMail } from './support/mailbox';
import {
  eventually,
  fund,
  onboard,
  openStudyWithCodedSteps,
  owedPayouts,
  providerClient,
  providerFaults,
} from './support/payout-fixtures';
import { Browser, signedInStaff } from './support/study-fixtures';
import { startTestApp, TestApp } from './support/test-app';

// The api listens where the payments stand-in delivers its webhooks (npm test points it at this port).
const WEBHOOK_PORT = Number(process.env.PAYMENTS_WEBHOOK_PORT ?? 3110);
const MAILBOX_URL = process.env.MAILBOX_URL ?? 'http://127.0.0.1:1080';
/** What a provider's own identifiers look like (transfers, accounts, payment intents, events). */
const PROVIDER_ID = /\b(?:tr|acct|pi|evt)_[A-Za-z0-9]/;
const STATUSES = ['owed', 'approved', 'sending', 'paid', 'failed', 'cancelled', 'reversed'] as const;
const STAGES = ['to-approve', 'awaiting-setup', 'on-its-way', 'needs-attention', 'paid', 'closed'] as const;

let testApp: TestApp;
let coordinator: Browser;
let provider: Stripe;

beforeAll(async () => {
  testApp = await startTestApp({ JOB_RETRY_DELAY_SECONDS: '1' });
  await testApp.app.listen(WEBHOOK_PORT, '127.0.0.1');
  coordinator = await signedInStaff(testApp, 'coordinator');
  provider = providerClient();
  await providerFaults();
});
afterAll(async () => {
  await testApp.close();
});

interface Row {
  id: string;
  enrollmentId: string;
  reference: string;
  amountMinor: number;
  status: string;
  stage: string;
  receiptNumber: string | null;
  providerTransferId: string | null;
  createdAt: string;
}

async function allRows(studyId: string, query: Record<string, string> = {}): Promise<Row[]> {
  const rows: Row[] = [];
  for (let page = 1; ; page++) {
    const answer = await expectStatus(
      coordinator.get(`/api/studies/${studyId}/payouts`).query({ ...query, page, pageSize: 500 }),
      200,
    );
    rows.push(...answer.items);
    if (answer.items.length < 500) return rows;
  }
}

/** One study, one coded step; Ada finishes payout set-up, Bo does not. */
async function studyWithTwoPayees() {
  const {
    studyId,
    version,
    stepIds: [stepId],
  } = await openStudyWithCodedSteps(coordinator, [['Session 1', 1000, 'ONE-1111']]);
  const people = [];
  for (const name of ['ada', 'bo']) {
    const { browser, email } = await signedUpParticipant(testApp, studyId, version, name, `Pat ${name}`);
    await expectStatus(
      browser.post(`/api/studies/${studyId}/enrollments/me/steps/${stepId}/complete`).send({ code: 'ONE-1111' }),
      200,
    );
    const me = await expectStatus(browser.get(`/api/studies/${studyId}/enrollments/me`), 200);
    people.push({ browser, email, enrollmentId: me.id as string });
  }
  const study = await expectStatus(coordinator.get(`/api/studies/${studyId}`), 200);
  return { studyId, slug: study.slug as string, ada: people[0], bo: people[1] };
}

describe('the Pay page', () => {
  let setup: Awaited<ReturnType<typeof studyWithTwoPayees>>;
  let paid: Row;

  beforeAll(async () => {
    setup = await studyWithTwoPayees();
    const { studyId, ada, bo } = setup;
    await owedPayouts(testApp, studyId, ada.enrollmentId, 3);
    await owedPayouts(testApp, studyId, bo.enrollmentId, 2);
    await onboard(ada.browser);
    await fund(coordinator, provider, studyId, 50_000);
    const rows = await allRows(studyId);
    const stepPayOf = (enrollmentId: string) =>
      rows.find((r) => r.enrollmentId === enrollmentId && r.amountMinor === 1000)!;
    // Bo has not set up payouts: his approved payout fails and needs attention; Ada's is paid.
    await expectStatus(
      coordinator
        .post(`/api/studies/${studyId}/payouts/approve`)
        .send({ payoutIds: [stepPayOf(bo.enrollmentId).id, stepPayOf(ada.enrollmentId).id] }),
      200,
    );
    await eventually(async () => {
      const now = await allRows(studyId);
      return now.filter((r) => r.status === 'paid' || r.status === 'failed').length === 2;
    }, 'one paid and one failed');
    paid = (await allRows(studyId)).find((r) => r.status === 'paid')!;
  });

  it('gives every total from one source: the cards and the stage sums equal the rows of the queue for every status', async () => {
    const { studyId } = setup;
    const budget = await expectStatus(coordinator.get(`/api/studies/${studyId}/budget`), 200);
    const queue = await expectStatus(coordinator.get(`/api/studies/${studyId}/payouts`), 200);
    const rows = await allRows(studyId);
    const sum = (list: Row[]) => list.reduce((total, r) => total + r.amountMinor, 0);
    for (const status of STATUSES) {
      const byFilter = await allRows(studyId, { status });
      expect(byFilter.every((r) => r.status === status)).toBe(true);
      expect(sum(byFilter)).toBe(sum(rows.filter((r) => r.status === status)));
      expect(queue.amountByStatus[status] ?? 0).toBe(sum(byFilter));
      expect(queue.countsByStatus[status] ?? 0).toBe(byFilter.length);
    }
    for (const stage of STAGES) {
      const byStage = await allRows(studyId, { stage });
      expect(byStage.every((r) => r.stage === stage)).toBe(true);
      expect(queue.stages[stage]).toEqual({
        count: byStage.length,
        amountMinor: sum(byStage),
        participants: new Set(byStage.map((r) => r.enrollmentId)).size,
      });
    }
    // The cards: owed is exactly the owed rows (not the failed ones), and each card matches its rows.
    expect(budget.owedMinor).toBe(sum(rows.filter((r) => r.status === 'owed')));
    expect(budget.needsAttentionMinor).toBe(sum(rows.filter((r) => r.status === 'failed')));
    expect(budget.committedMinor).toBe(sum(rows.filter((r) => r.status === 'approved' || r.status === 'sending')));
    expect(budget.paidMinor).toBe(sum(rows.filter((r) => r.status === 'paid')));
    expect(budget).toMatchObject({ owedMinor: 500, needsAttentionMinor: 1000, paidMinor: 1000 });
    // Who would be paid now and who waits for set-up, counted exactly.
    expect(queue.stages['to-approve']).toEqual({ count: 3, amountMinor: 300, participants: 1 });
    expect(queue.stages['awaiting-setup']).toEqual({ count: 2, amountMinor: 200, participants: 1 });
    expect(queue.stages['needs-attention']).toEqual({ count: 1, amountMinor: 1000, participants: 1 });
  });

  it('searches by participant reference and sorts by amount and date', async () => {
    const { studyId, ada } = setup;
    const rows = await allRows(studyId);
    const adaReference = rows.find((r) => r.enrollmentId === ada.enrollmentId)!.reference;
    const found = await allRows(studyId, { search: adaReference.toLowerCase() });
    expect(found.length).toBe(rows.filter((r) => r.enrollmentId === ada.enrollmentId).length);
    expect(found.every((r) => r.enrollmentId === ada.enrollmentId)).toBe(true);
    // As the Pay page asks within a group: the paid group, searched by the reference shown on a row, largest first.
    const paidOfAda = await allRows(studyId, { stage: 'paid', search: adaReference, sort: 'amount-desc' });
    expect(paidOfAda.map((r) => r.id)).toEqual([paid.id]);
    const byAmount = (await allRows(studyId, { sort: 'amount-desc' })).map((r) => r.amountMinor);
    expect(byAmount).toEqual([...byAmount].sort((a, b) => b - a));
    const oldest = (await allRows(studyId, { sort: 'oldest' })).map((r) => r.createdAt);
    expect(oldest).toEqual([...oldest].sort());
    const history = await allRows(studyId, { enrollmentId: ada.enrollmentId });
    expect(history.map((r) => r.id).sort()).toEqual(found.map((r) => r.id).sort());
    const bad = await expectStatus(
      coordinator.get(`/api/studies/${studyId}/payouts`).query({ sort: 'sideways' }),
      400,
      'VALIDATION_FAILED',
    );
    expect(bad.errors[0].field).toBe('sort');
  });

  it('gives participants our own receipt number and keeps the provider transfer id for staff', async () => {
    const { slug, ada } = setup;
    expect(paid.receiptNumber).toBe(`${slug}-0001`);
    expect(paid.providerTransferId).toMatch(/^tr_/);
    const mine = await expectStatus(ada.browser.get('/api/me/payouts'), 200);
    expect(mine.items.find((p: { status: string }) => p.status === 'paid')).toMatchObject({
      receipt: paid.receiptNumber,
    });
    const receipt = await waitForMail(ada.email, 20_000, /receipt/i);
    expect(receipt.text).toContain(`Receipt number: ${paid.receiptNumber}`);
  });

  it('shows no provider identifier on any participant-facing answer or e-mail', async () => {
    const { studyId, ada, bo } = setup;
    for (const person of [ada, bo]) {
      for (const path of [
        '/api/me/payouts',
        '/api/me/payout-account',
        `/api/studies/${studyId}/enrollments/me`,
        '/api/auth/me',
      ]) {
        const body = await expectStatus(person.browser.get(path), 200);
        expect(JSON.stringify(body), path).not.toMatch(PROVIDER_ID);
      }
      const mail = (await (await fetch(`${MAILBOX_URL}/api/email`)).json()) as Array<{
        to: Array<{ address: string }>;
        subject: string;
        text: string;
        html: string;
      }>;
      const theirs = mail.filter((m) => m.to.some((to) => to.address.toLowerCase() === person.email.toLowerCase()));
      expect(theirs.length).toBeGreaterThan(0);
      for (const message of theirs)
        expect(`${message.subject}\n${message.text}\n${message.html ?? ''}`, message.subject).not.toMatch(PROVIDER_ID);
    }
  });

  it('exports a period for the finance office: totals per participant, tax threshold, units and minor units, named by slug and period', async () => {
    const { studyId, slug, ada } = setup;
    const today = new Date().toISOString().slice(0, 10);
    const response = await coordinator
      .get(`/api/studies/${studyId}/payouts/finance-export.csv`)
      .query({ from: today, to: today })
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = [];
        res.on('data', (chunk: Buffer) => chunks.push(chunk));
        res.on('end', () => done(null, Buffer.concat(chunks)));
      });
    expect(response.status).toBe(200);
    expect(response.headers['content-type']).toMatch(/text\/csv/);
    expect(response.headers['content-disposition']).toBe(
      `attachment; filename="${slug}-payments-${today}-to-${today}.csv"`,
    );
    const bytes = response.body as Buffer;
    expect([...bytes.subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    const lines = bytes.subarray(3).toString('utf8').trim().split(/\r?\n/);
    expect(lines[0]).toBe(
      'participant_reference,payments_in_period,paid_in_period,paid_in_period_minor,currency,paid_this_year_all_studies,paid_this_year_all_studies_minor,tax_reporting_threshold,tax_threshold_standing',
    );
    const adaReference = (await allRows(studyId, { enrollmentId: ada.enrollmentId }))[0].reference;
    expect(lines.slice(1)).toEqual([`${adaReference},1,10.00,1000,USD,10.00,1000,2000.00,under`]);
    const bad = await expectStatus(
      coordinator.get(`/api/studies/${studyId}/payouts/finance-export.csv`).query({ from: today, to: '2020-01-01' }),
      400,
      'VALIDATION_FAILED',
    );
    expect(bad.errors[0].field).toBe('to');
    const malformed = await expectStatus(
      coordinator.get(`/api/studies/${studyId}/payouts/finance-export.csv`).query({ from: 'yesterday', to: today }),
      400,
      'VALIDATION_FAILED',
    );
    expect(malformed.errors[0].field).toBe('from');
  });
});
