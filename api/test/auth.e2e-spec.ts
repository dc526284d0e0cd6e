import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cookiesOf, expectStatus } from './support/http';
import { signInTokenFrom, uniqueAddress, waitForMail } from './support/mailbox';
import { startTestApp, TestApp } from './support/test-app';

let testApp: TestApp;

beforeAll(async () => {
  testApp = await startTestApp();
});
afterAll(async () => {
  await testApp.close();
});

async function requestLinkAndReadToken(email: string): Promise<string> {
  await expectStatus(testApp.browser().post('/api/auth/sign-in-link').send({ email }), 202);
  return signInTokenFrom(await waitForMail(email));
}

describe('staff sign-in', () => {
  it('signs a demo coordinator in with HttpOnly, SameSite=Lax cookies and answers /auth/me', async () => {
    const browser = testApp.browser();
    const response = await browser
      .post('/api/auth/sign-in')
      .send({ email: 'Coordinator@Evenhand.test ', password: 'evenhand-demo' })
      .expect(200);
    expect(response.body.user).toMatchObject({ email: 'coordinator@evenhand.test', role: 'coordinator' });
    const cookies = cookiesOf(response);
    expect(cookies.find((c) => c.startsWith('eh_access='))).toMatch(/HttpOnly; SameSite=Lax/);
    expect(cookies.find((c) => c.startsWith('eh_refresh='))).toMatch(/Path=\/api\/auth; .*HttpOnly; SameSite=Lax/);
    const me = await expectStatus(browser.get('/api/auth/me'), 200);
    expect(me).toMatchObject({ email: 'coordinator@evenhand.test', role: 'coordinator', active: true });
  });

  it('gives the same answer for a wrong password and for an unknown address', async () => {
    const wrong = await expectStatus(
      testApp.browser().post('/api/auth/sign-in').send({ email: 'admin@evenhand.test', password: 'not-the-password' }),
      401,
      'INVALID_CREDENTIALS',
    );
    const unknown = await expectStatus(
      testApp.browser().post('/api/auth/sign-in').send({ email: 'nobody@evenhand.test', password: 'not-the-password' }),
      401,
      'INVALID_CREDENTIALS',
    );
    expect(unknown.message).toBe(wrong.message);
  });

  it('records a failed sign-in in the audit trail', async () => {
    await expectStatus(
      testApp
        .browser()
        .post('/api/auth/sign-in')
        .send({ email: 'auditor@evenhand.test', password: 'wrong-password-x' }),
      401,
    );
    const [row] = await testApp.dataSource.query(
      `SELECT action, subject_id FROM audit_event WHERE action = 'auth.sign-in-failed' AND subject_id = 'auditor@evenhand.test'`,
    );
    expect(row).toBeDefined();
  });

  it('refuses /auth/me without a session', async () => {
    await expectStatus(testApp.browser().get('/api/auth/me'), 401, 'UNAUTHENTICATED');
  });

  it('signs out: the refresh token stops working', async () => {
    const browser = testApp.browser();
    await expectStatus(
      browser.post('/api/auth/sign-in').send({ email: 'researcher@evenhand.test', password: 'evenhand-demo' }),
      200,
    );
    await expectStatus(browser.post('/api/auth/sign-out'), 204);
    await expectStatus(browser.get('/api/auth/me'), 401);
    await expectStatus(browser.post('/api/auth/refresh'), 401);
  });
});

describe('participant sign-in by e-mailed link', () => {
  it('creates the account on first use and signs the person in', async () => {
    const email = uniqueAddress('first-visit');
    const token = await requestLinkAndReadToken(email);
    const browser = testApp.browser();
    const session = await expectStatus(browser.post('/api/auth/sign-in-link/consume').send({ token }), 200);
    expect(session.user).toMatchObject({ email, role: 'participant' });
    expect(await expectStatus(browser.get('/api/auth/me'), 200)).toMatchObject({ email, role: 'participant' });
  });

  it('stores only a hash of the token', async () => {
    const email = uniqueAddress('hashed');
    const token = await requestLinkAndReadToken(email);
    const rows = await testApp.dataSource.query(`SELECT token_hash FROM sign_in_link WHERE email = $1`, [email]);
    expect(rows).toHaveLength(1);
    expect(rows[0].token_hash).not.toContain(token);
    expect(rows[0].token_hash).toMatch(/^[0-9a-f]{64}$/);
  });

  it('refuses a link the second time', async () => {
    const token = await requestLinkAndReadToken(uniqueAddress('reuse'));
    await expectStatus(testApp.browser().post('/api/auth/sign-in-link/consume').send({ token }), 200);
    await expectStatus(testApp.browser().post('/api/auth/sign-in-link/consume').send({ token }), 400, 'LINK_INVALID');
  });

  it('refuses an expired link', async () => {
    const email = uniqueAddress('expired');
    const token = await requestLinkAndReadToken(email);
    await testApp.dataSource.query(
      `UPDATE sign_in_link SET expires_at = now() - interval '1 second' WHERE email = $1`,
      [email],
    );
    await expectStatus(testApp.browser().post('/api/auth/sign-in-link/consume').send({ token }), 400, 'LINK_INVALID');
  });

  it('refuses an unknown token', async () => {
    await expectStatus(
      testApp
        .browser()
        .post('/api/auth/sign-in-link/consume')
        .send({ token: 'x'.repeat(43) }),
      400,
      'LINK_INVALID',
    );
  });

  it('answers the same for a staff address but sends it no link', async () => {
    const answer = await expectStatus(
      testApp.browser().post('/api/auth/sign-in-link').send({ email: 'admin@evenhand.test' }),
      202,
    );
    expect(answer).toEqual({ sent: true });
    const rows = await testApp.dataSource.query(`SELECT 1 FROM sign_in_link WHERE email = 'admin@evenhand.test'`);
    expect(rows).toHaveLength(0);
  });

  it('does not let a participant use the staff password sign-in', async () => {
    const email = uniqueAddress('no-password');
    const token = await requestLinkAndReadToken(email);
    await expectStatus(testApp.browser().post('/api/auth/sign-in-link/consume').send({ token }), 200);
    await expectStatus(
      testApp.browser().post('/api/auth/sign-in').send({ email, password: 'anything-at-all' }),
      401,
      'INVALID_CREDENTIALS',
    );
  });
});

describe('refresh tokens', () => {
  async function signedInBrowser() {
    const browser = testApp.browser();
    const response = await browser
      .post('/api/auth/sign-in')
      .send({ email: 'coordinator@evenhand.test', password: 'evenhand-demo' })
      .expect(200);
    const refresh = cookiesOf(response)
      .find((c) => c.startsWith('eh_refresh='))!
      .split(';')[0];
    return { browser, refresh };
  }

  it('rotates the refresh token on every refresh', async () => {
    const { browser, refresh } = await signedInBrowser();
    const response = await browser.post('/api/auth/refresh').expect(200);
    const rotated = cookiesOf(response)
      .find((c) => c.startsWith('eh_refresh='))!
      .split(';')[0];
    expect(rotated).not.toBe(refresh);
    await expectStatus(browser.get('/api/auth/me'), 200);
  });

  it('revokes the whole family when a rotated token is presented again', async () => {
    const { browser, refresh: stolen } = await signedInBrowser();
    await expectStatus(browser.post('/api/auth/refresh'), 200);
    // Past the grace window that lets two tabs refresh at once (see hardening.e2e-spec.ts).
    await testApp.dataSource.query(
      `UPDATE refresh_token SET replaced_at = now() - interval '1 hour' WHERE token_hash = encode(sha256($1::bytea), 'hex')`,
      [stolen.split('=')[1]],
    );
    // An attacker replays the first token after the rightful owner has already rotated it.
    await expectStatus(testApp.browser().post('/api/auth/refresh').set('Cookie', stolen), 401, 'UNAUTHENTICATED');
    // The owner's current token belongs to the revoked family now, so it fails too.
    await expectStatus(browser.post('/api/auth/refresh'), 401, 'UNAUTHENTICATED');
    const [event] = await testApp.dataSource.query(
      `SELECT 1 FROM audit_event WHERE action = 'auth.refresh-reuse-detected' ORDER BY at DESC LIMIT 1`,
    );
    expect(event).toBeDefined();
  });

  it('refuses refresh without a cookie', async () => {
    await expectStatus(testApp.browser().post('/api/auth/refresh'), 401, 'UNAUTHENTICATED');
  });
});
