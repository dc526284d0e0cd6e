import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { expectStatus } from './support/http';
import { signInTokenFrom, uniqueAddress, waitForMail } from './support/mailbox';
import { startTestApp, TestApp } from './support/test-app';

let testApp: TestApp;
const browsers: Record<string, ReturnType<TestApp['browser']>> = {};

beforeAll(async () => {
  testApp = await startTestApp();
  for (const role of ['admin', 'coordinator', 'researcher', 'auditor']) {
    browsers[role] = testApp.browser();
    await expectStatus(
      browsers[role].post('/api/auth/sign-in').send({ email: `${role}@evenhand.test`, password: 'evenhand-demo' }),
      200,
    );
  }
  const email = uniqueAddress('roles-participant');
  await expectStatus(testApp.browser().post('/api/auth/sign-in-link').send({ email }), 202);
  const token = signInTokenFrom(await waitForMail(email));
  browsers.participant = testApp.browser();
  await expectStatus(browsers.participant.post('/api/auth/sign-in-link/consume').send({ token }), 200);
});
afterAll(async () => {
  await testApp.close();
});

describe('staff management', () => {
  it('lets an admin create, find, change and deactivate a staff member', async () => {
    const email = uniqueAddress('new-staff');
    const created = await expectStatus(
      browsers.admin
        .post('/api/users')
        .send({ email, name: 'Noor Testperson', role: 'researcher', password: 'a-long-password-1' }),
      201,
    );
    expect(created).toMatchObject({
      email,
      name: 'Noor Testperson',
      role: 'researcher',
      active: true,
      lastSignInAt: null,
    });
    expect(created).not.toHaveProperty('passwordHash');

    const page = await expectStatus(browsers.admin.get('/api/users').query({ search: 'noor testp' }), 200);
    expect(page.items.map((u: { email: string }) => u.email)).toContain(email);
    // One person's page reads them by id.
    const one = await expectStatus(browsers.admin.get(`/api/users/${created.id}`), 200);
    expect(one).toMatchObject({ id: created.id, email, name: 'Noor Testperson', role: 'researcher' });
    await expectStatus(browsers.admin.get('/api/users/00000000-0000-4000-8000-000000000000'), 404, 'NOT_FOUND');

    const staffBrowser = testApp.browser();
    await expectStatus(staffBrowser.post('/api/auth/sign-in').send({ email, password: 'a-long-password-1' }), 200);

    const changed = await expectStatus(
      browsers.admin.patch(`/api/users/${created.id}`).send({ role: 'coordinator' }),
      200,
    );
    expect(changed.role).toBe('coordinator');
    await expectStatus(browsers.admin.patch(`/api/users/${created.id}`).send({ active: false }), 200);
    // Deactivation takes effect on the very next request, and the password stops working.
    await expectStatus(staffBrowser.get('/api/auth/me'), 401);
    await expectStatus(testApp.browser().post('/api/auth/sign-in').send({ email, password: 'a-long-password-1' }), 401);

    const actions = await testApp.dataSource.query(
      `SELECT action FROM audit_event WHERE subject_id = $1 ORDER BY chain, sequence`,
      [created.id],
    );
    expect(actions.map((a: { action: string }) => a.action)).toEqual(
      expect.arrayContaining(['user.created', 'user.updated', 'user.deactivated', 'auth.signed-in']),
    );
  });

  it('refuses a duplicate e-mail with a field error', async () => {
    const body = await expectStatus(
      browsers.admin
        .post('/api/users')
        .send({ email: 'auditor@evenhand.test', name: 'Dup', role: 'auditor', password: 'a-long-password-1' }),
      409,
      'EMAIL_TAKEN',
    );
    expect(body.errors).toEqual([{ field: 'email', message: expect.any(String) }]);
  });

  it('refuses a short password and a participant role, naming each field', async () => {
    const body = await expectStatus(
      browsers.admin
        .post('/api/users')
        .send({ email: uniqueAddress('short'), name: 'Short', role: 'participant', password: 'short' }),
      400,
      'VALIDATION_FAILED',
    );
    const fields = body.errors.map((e: { field: string }) => e.field).sort();
    expect(fields).toEqual(['password', 'role']);
  });

  it('does not let an admin deactivate their own account', async () => {
    const me = await expectStatus(browsers.admin.get('/api/auth/me'), 200);
    await expectStatus(
      browsers.admin.patch(`/api/users/${me.id}`).send({ active: false }),
      400,
      'OWN_ACCOUNT_PROTECTED',
    );
  });

  it('answers 404 for an unknown user id and 400 for a malformed one', async () => {
    await expectStatus(
      browsers.admin.patch('/api/users/00000000-0000-4000-8000-000000000000').send({ name: 'X' }),
      404,
      'NOT_FOUND',
    );
    await expectStatus(browsers.admin.patch('/api/users/not-a-uuid').send({ name: 'X' }), 400);
  });
});

describe('roles', () => {
  const refusals: Array<[string, string, string]> = [
    ['coordinator', 'get', '/api/users'],
    ['researcher', 'get', '/api/users'],
    ['auditor', 'get', '/api/users'],
    ['participant', 'get', '/api/users'],
    ['coordinator', 'post', '/api/users'],
    ['participant', 'patch', '/api/users/00000000-0000-4000-8000-000000000000'],
    ['coordinator', 'get', '/api/users/00000000-0000-4000-8000-000000000000'],
    ['coordinator', 'get', '/api/audit'],
    ['researcher', 'get', '/api/audit/verify'],
    ['participant', 'get', '/api/audit'],
  ];
  it.each(refusals)('refuses a %s at %s %s with 403', async (role, method, path) => {
    const call = (browsers[role] as any)[method](path);
    await expectStatus(method === 'get' ? call : call.send({}), 403, 'FORBIDDEN');
  });

  it('lets an auditor read the audit trail and an admin verify it', async () => {
    await expectStatus(browsers.auditor.get('/api/audit'), 200);
    await expectStatus(browsers.admin.get('/api/audit/verify'), 200);
  });

  it('shows a coordinator only the studies they are a member of', async () => {
    const slug = `member-check-${Date.now().toString(36)}`;
    await expectStatus(
      browsers.coordinator.post('/api/studies').send({ slug, title: 'Member check', design: 'between' }),
      201,
    );
    const coordinatorStudies = await expectStatus(browsers.coordinator.get('/api/studies'), 200);
    expect(coordinatorStudies.items.map((s: { slug: string }) => s.slug)).toContain(slug);
    const email = uniqueAddress('outsider');
    await expectStatus(
      browsers.admin
        .post('/api/users')
        .send({ email, name: 'Outsider', role: 'researcher', password: 'a-long-password-1' }),
      201,
    );
    const outsider = testApp.browser();
    await expectStatus(outsider.post('/api/auth/sign-in').send({ email, password: 'a-long-password-1' }), 200);
    expect((await expectStatus(outsider.get('/api/studies'), 200)).items).toEqual([]);
    expect((await expectStatus(browsers.participant.get('/api/studies'), 200)).items).toEqual([]);
  });
});
