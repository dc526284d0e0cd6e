import { RequestMethod } from '@nestjs/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildOpenApiDocument } from '../src/app-setup';
import { signedInParticipant } from './support/consent-fixtures';
import { expectStatus } from './support/http';
import { uniqueAddress } from './support/mailbox';
import { Browser, draftBetweenStudy, signedInStaff } from './support/study-fixtures';
import { startTestApp, TestApp } from './support/test-app';

let testApp: TestApp;
let admin: Browser;

beforeAll(async () => {
  testApp = await startTestApp();
  admin = await signedInStaff(testApp, 'admin');
});
afterAll(async () => {
  await testApp.close();
});

async function staffAccount(
  role: 'coordinator' | 'researcher' | 'auditor',
): Promise<{ id: string; email: string; browser: Browser }> {
  const email = uniqueAddress(role);
  const user = await expectStatus(
    admin.post('/api/users').send({ email, name: `Matrix ${role}`, role, password: 'a-long-password-1' }),
    201,
  );
  const browser = testApp.browser();
  await expectStatus(browser.post('/api/auth/sign-in').send({ email, password: 'a-long-password-1' }), 200);
  return { id: user.id, email, browser };
}

describe('study membership', () => {
  it('is managed by admins only, with a membership role that matches the staff role', async () => {
    const researcher = await signedInStaff(testApp, 'researcher');
    const { studyId } = await draftBetweenStudy(researcher);
    const colleague = await staffAccount('researcher');
    const coordinator = await staffAccount('coordinator');

    // Members who are not admins cannot add anyone, whatever the role asked for.
    await expectStatus(
      researcher.post(`/api/studies/${studyId}/members`).send({ email: coordinator.email, role: 'coordinator' }),
      403,
      'FORBIDDEN',
    );
    const mismatch = await expectStatus(
      admin.post(`/api/studies/${studyId}/members`).send({ email: colleague.email, role: 'coordinator' }),
      400,
      'VALIDATION_FAILED',
    );
    expect(mismatch.errors[0]).toMatchObject({ field: 'role' });

    await expectStatus(colleague.browser.get(`/api/studies/${studyId}`), 404, 'NOT_FOUND');
    const added = await expectStatus(
      admin.post(`/api/studies/${studyId}/members`).send({ email: colleague.email, role: 'researcher' }),
      201,
    );
    expect(added.items.map((m: { email: string }) => m.email)).toContain(colleague.email);
    await expectStatus(colleague.browser.get(`/api/studies/${studyId}`), 200);
    const theirStudies = await expectStatus(admin.get(`/api/staff/${colleague.id}/studies`), 200);
    expect(theirStudies.items).toEqual([expect.objectContaining({ studyId, role: 'researcher' })]);

    await expectStatus(researcher.delete(`/api/studies/${studyId}/members/${colleague.id}`), 403, 'FORBIDDEN');
    await expectStatus(admin.delete(`/api/studies/${studyId}/members/${colleague.id}`), 200);
    await expectStatus(colleague.browser.get(`/api/studies/${studyId}`), 404, 'NOT_FOUND');
    const notMember = await expectStatus(
      admin.delete(`/api/studies/${studyId}/members/${colleague.id}`),
      404,
      'NOT_FOUND',
    );
    expect(notMember.errors[0].field).toBe('userId');
    const [events] = await testApp.dataSource.query(
      `SELECT count(*) FILTER (WHERE action = 'study.member-added')::int AS added, count(*) FILTER (WHERE action = 'study.member-removed')::int AS removed FROM audit_event WHERE chain = $1`,
      [studyId],
    );
    expect(events).toEqual({ added: 1, removed: 1 });
  });
});

/**
 * Every route in the route table that names a study, called by each kind of identity. Outsiders (staff who are not
 * members, and participants outside their own enrollment routes) get 403 or 404 and write nothing into the study's
 * trail; members and admins never get 401 or a 5xx. A new route is covered by default.
 */
describe('role × route × membership matrix', () => {
  it('keeps every study route closed to outsiders and open to members', async () => {
    const owner = await staffAccount('researcher');
    const { studyId } = await draftBetweenStudy(owner.browser);
    const memberCoordinator = await staffAccount('coordinator');
    await expectStatus(
      admin.post(`/api/studies/${studyId}/members`).send({ email: memberCoordinator.email, role: 'coordinator' }),
      201,
    );
    const outsiderCoordinator = await staffAccount('coordinator');
    const outsiderResearcher = await staffAccount('researcher');
    const { browser: participant } = await signedInParticipant(testApp, 'matrix');
    // A payout of this study, so the payout routes are tried on a real object.
    const [user] = await testApp.dataSource.query(
      `INSERT INTO user_account (email, role) VALUES ($1, 'participant') RETURNING id`,
      [uniqueAddress('matrix-payee')],
    );
    const [enrollment] = await testApp.dataSource.query(
      `INSERT INTO enrollment (study_id, participant_id, reference, status) VALUES ($1, $2, $3, 'active') RETURNING id`,
      [studyId, user.id, `M-${Date.now().toString(36).toUpperCase()}`],
    );
    const [payout] = await testApp.dataSource.query(
      `INSERT INTO payout (study_id, enrollment_id, participant_id, kind, amount_minor, currency, status, idempotency_key, failure_reason)
       VALUES ($1, $2, $3, 'bonus', 100, 'USD', 'failed', gen_random_uuid()::text, 'test') RETURNING id`,
      [studyId, enrollment.id, user.id],
    );

    const dummy = '00000000-0000-4000-8000-000000000000';
    const document = buildOpenApiDocument(testApp.app);
    const routes = Object.entries(document.paths)
      .flatMap(([template, item]) =>
        Object.keys(item)
          .filter((method) => method.toUpperCase() in RequestMethod)
          .map((method) => ({ method, template })),
      )
      .filter(({ template }) => template.includes('{studyId}') || template.includes('{payoutId}'))
      .map(({ method, template }) => ({
        method,
        template,
        path: template
          .replace('{studyId}', studyId)
          .replace('{payoutId}', payout.id)
          .replace(/\{[^}]+\}/g, dummy),
        ownEnrollment: template.includes('/enrollments/me'),
      }));
    expect(routes.length).toBeGreaterThan(40);

    const trail = async () =>
      (await testApp.dataSource.query(`SELECT count(*)::int AS n FROM audit_event WHERE chain = $1`, [studyId]))[0]
        .n as number;
    const call = (browser: Browser, method: string, path: string) => {
      const agent = browser as unknown as Record<
        string,
        (p: string) => { send(b: object): Promise<{ status: number }> }
      >;
      return agent[method](path).send({});
    };
    const problems: string[] = [];
    let calls = 0;

    for (const [name, browser] of [
      ['outsider coordinator', outsiderCoordinator.browser],
      ['outsider researcher', outsiderResearcher.browser],
      ['participant', participant],
    ] as const) {
      for (const route of routes) {
        if (name === 'participant' && route.ownEnrollment) continue;
        const before = await trail();
        const { status } = await call(browser, route.method, route.path);
        calls += 1;
        if (status !== 403 && status !== 404)
          problems.push(`${name}: ${route.method.toUpperCase()} ${route.template} → ${status}`);
        if ((await trail()) !== before)
          problems.push(`${name}: ${route.method.toUpperCase()} ${route.template} wrote into the study's trail`);
      }
    }
    for (const [name, browser] of [
      ['member coordinator', memberCoordinator.browser],
      ['owner researcher', owner.browser],
      ['admin', admin],
    ] as const) {
      for (const route of routes) {
        const { status } = await call(browser, route.method, route.path);
        calls += 1;
        if (status === 401 || status >= 500)
          problems.push(`${name}: ${route.method.toUpperCase()} ${route.template} → ${status}`);
        if (status === 403 && !route.ownEnrollment && name === 'admin')
          problems.push(`admin: ${route.method.toUpperCase()} ${route.template} → 403`);
      }
    }
    expect(problems).toEqual([]);
    expect(calls).toBeGreaterThan(200);
  });
});
