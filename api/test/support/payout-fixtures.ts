import Stripe from 'stripe';
import { expect } from 'vitest';
import { activeConsentVersion, signedUpParticipant } from './consent-fixtures';
import { expectStatus } from './http';
import { Browser, draftBetweenStudy } from './study-fixtures';
import type { TestApp } from './test-app';

export const PROVIDER_URL = `http://127.0.0.1:${process.env.STRIPE_PORT ?? 3200}`;
export const WEBHOOK_SECRET = 'whsec_evenhand_dev';

/** The provider's SDK as a test drives it, pointed at the stand-in. */
export function providerClient(): Stripe {
  return new Stripe('sk_test_evenhand_local', {
    host: '127.0.0.1',
    port: Number(process.env.STRIPE_PORT ?? 3200),
    protocol: 'http',
  });
}

/** Switches the stand-in's faults (POST) or clears them all (no body). */
export async function providerFaults(change?: Record<string, unknown>): Promise<void> {
  const response = await fetch(`${PROVIDER_URL}/_control/faults`, {
    method: change ? 'POST' : 'DELETE',
    headers: change ? { 'Content-Type': 'application/json' } : {},
    body: change ? JSON.stringify(change) : undefined,
  });
  expect(response.status).toBe(200);
}

/** Polls until `check` gives something truthy; the deadline is generous because CI machines are busy. */
export async function eventually<T>(
  check: () => Promise<T | undefined | false>,
  what: string,
  timeoutMs = 60_000,
): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await check();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
}

/** A recruiting study whose steps are each verified by one completion code, as `[title, payMinor, code]`. */
export async function openStudyWithCodedSteps(
  coordinator: Browser,
  codedSteps: ReadonlyArray<readonly [title: string, payMinor: number, code: string]>,
) {
  const { studyId } = await draftBetweenStudy(coordinator);
  const stepIds: string[] = [];
  for (const [title, payMinor, code] of codedSteps) {
    const steps = await expectStatus(coordinator.post(`/api/studies/${studyId}/steps`).send({ title, payMinor }), 201);
    const step = steps.items.find((s: { title: string }) => s.title === title);
    await expectStatus(coordinator.put(`/api/studies/${studyId}/steps/${step.id}/completion-code`).send({ code }), 200);
    stepIds.push(step.id);
  }
  const version = await activeConsentVersion(coordinator, studyId);
  await expectStatus(coordinator.post(`/api/studies/${studyId}/open`), 200);
  return { studyId, version, stepIds };
}

/** A recruiting study with one coded step, and a participant who has signed. */
export async function studyWithParticipant(testApp: TestApp, coordinator: Browser, name = 'payee') {
  const { studyId, version } = await openStudyWithCodedSteps(coordinator, [['Session 1', 1000, 'ONE-1111']]);
  const { browser, email, me } = await signedUpParticipant(testApp, studyId, version, name, 'Pat Payee');
  return { studyId, browser, email, enrollmentId: me.id as string };
}

/** Finishes the provider's hosted onboarding page for this participant and waits until the api knows. */
export async function onboard(browser: Browser): Promise<string> {
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
  await eventually(
    async () => (await expectStatus(browser.get('/api/me/payout-account'), 200)).payoutsEnabled,
    'payouts enabled',
  );
  return url;
}

/** Funds the study as the admin's card form does: a payment intent confirmed with a test card. */
export async function fund(
  coordinator: Browser,
  provider: Stripe,
  studyId: string,
  amountMinor: number,
): Promise<void> {
  const intent = await expectStatus(coordinator.post(`/api/studies/${studyId}/funding`).send({ amountMinor }), 201);
  const paymentIntentId = intent.clientSecret.split('_secret_')[0];
  await provider.paymentIntents.confirm(paymentIntentId, { payment_method: 'pm_card_visa' });
  await eventually(
    async () => (await expectStatus(coordinator.get(`/api/studies/${studyId}/budget`), 200)).fundedMinor >= amountMinor,
    'funding',
  );
}

/** Owed payouts of 100 minor units each, written straight into the ledger (as a busy study would have them). */
export async function owedPayouts(
  testApp: TestApp,
  studyId: string,
  enrollmentId: string,
  count: number,
): Promise<string[]> {
  const [{ participant_id: participantId }] = await testApp.dataSource.query(
    `SELECT participant_id FROM enrollment WHERE id = $1`,
    [enrollmentId],
  );
  const rows: Array<{ id: string }> = await testApp.dataSource.query(
    `INSERT INTO payout (id, study_id, enrollment_id, participant_id, kind, amount_minor, currency, idempotency_key)
     SELECT g.id, $1, $2, $3, 'step', 100, 'USD', g.id::text FROM (SELECT gen_random_uuid() AS id FROM generate_series(1, $4::int)) g
     RETURNING id`,
    [studyId, enrollmentId, participantId, count],
  );
  return rows.map((r) => r.id);
}

export async function payoutStatuses(
  testApp: TestApp,
  studyId: string,
): Promise<Array<{ id: string; status: string; failure_reason: string | null; provider_transfer_id: string | null }>> {
  return testApp.dataSource.query(
    `SELECT id, status, failure_reason, provider_transfer_id FROM payout WHERE study_id = $1 ORDER BY id`,
    [studyId],
  );
}
