import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { expectStatus } from './support/http';
import { signInTokenFrom, uniqueAddress, waitForMail } from './support/mailbox';
import { eventually } from './support/payout-fixtures';
import { Browser, signedInStaff } from './support/study-fixtures';
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

async function newStaff(password = 'temporary-password-1'): Promise<{ email: string; browser: Browser }> {
  const email = uniqueAddress('pw');
  await expectStatus(
    admin.post('/api/users').send({ email, name: 'Pat Password', role: 'coordinator', password }),
    201,
  );
  const browser = testApp.browser();
  await expectStatus(browser.post('/api/auth/sign-in').send({ email, password }), 200);
  return { email, browser };
}

describe('changing one’s own password', () => {
  it('needs the current password, refuses a short one, and then only the new one signs in', async () => {
    const { email, browser } = await newStaff();
    const wrong = await expectStatus(
      browser
        .post('/api/auth/password')
        .send({ currentPassword: 'not-the-password', newPassword: 'a-brand-new-password' }),
      400,
      'VALIDATION_FAILED',
    );
    expect(wrong.errors).toEqual([expect.objectContaining({ field: 'currentPassword' })]);
    const short = await expectStatus(
      browser.post('/api/auth/password').send({ currentPassword: 'temporary-password-1', newPassword: 'short' }),
      400,
    );
    expect(short.errors[0].field).toBe('newPassword');
    const same = await expectStatus(
      browser
        .post('/api/auth/password')
        .send({ currentPassword: 'temporary-password-1', newPassword: 'temporary-password-1' }),
      400,
    );
    expect(same.errors[0].field).toBe('newPassword');

    await expectStatus(
      browser
        .post('/api/auth/password')
        .send({ currentPassword: 'temporary-password-1', newPassword: 'a-brand-new-password' }),
      204,
    );
    // The session that changed it carries on; the old password no longer works.
    await expectStatus(browser.get('/api/auth/me'), 200);
    await expectStatus(
      testApp.browser().post('/api/auth/sign-in').send({ email, password: 'temporary-password-1' }),
      401,
    );
    await expectStatus(
      testApp.browser().post('/api/auth/sign-in').send({ email, password: 'a-brand-new-password' }),
      200,
    );
    const [event] = await testApp.dataSource.query(
      `SELECT count(*)::int AS n FROM audit_event WHERE action = 'user.password-changed' AND data->>'email' = $1`,
      [email],
    );
    expect(event.n).toBe(1);
  });

  it('is for staff only', async () => {
    await expectStatus(
      testApp.browser().post('/api/auth/password').send({ currentPassword: 'x', newPassword: 'a-brand-new-password' }),
      401,
    );
  });
});

describe('resetting a forgotten password by e-mailed link', () => {
  it('answers the same whether or not the address is known, and mails a single-use link only to staff', async () => {
    const { email, browser: oldSession } = await newStaff();
    const unknown = uniqueAddress('nobody');
    const forKnown = await expectStatus(testApp.browser().post('/api/auth/password-reset').send({ email }), 202);
    const forUnknown = await expectStatus(
      testApp.browser().post('/api/auth/password-reset').send({ email: unknown }),
      202,
    );
    expect(forKnown).toEqual(forUnknown);

    const mail = await waitForMail(email, 20_000, /password/i);
    expect(mail.text).toContain('/reset-password?token=');
    const token = signInTokenFrom(mail);

    const weak = await expectStatus(
      testApp.browser().post('/api/auth/password-reset/consume').send({ token, newPassword: 'short' }),
      400,
    );
    expect(weak.errors[0].field).toBe('newPassword');
    await expectStatus(
      testApp.browser().post('/api/auth/password-reset/consume').send({ token, newPassword: 'reset-password-two' }),
      204,
    );
    // Used once: a second use is refused, and every earlier session has ended.
    await expectStatus(
      testApp.browser().post('/api/auth/password-reset/consume').send({ token, newPassword: 'reset-password-three' }),
      400,
      'LINK_INVALID',
    );
    await expectStatus(oldSession.get('/api/auth/me'), 401);
    await expectStatus(
      testApp.browser().post('/api/auth/sign-in').send({ email, password: 'reset-password-two' }),
      200,
    );

    // The unknown address got nothing: the job ran (its queue drained) and no mail was written for it.
    await eventually(async () => {
      const [row] = await testApp.dataSource.query(
        `SELECT count(*)::int AS n FROM job_queue.job WHERE name = 'auth.password-reset' AND state IN ('created', 'retry', 'active')`,
      );
      return row.n === 0;
    }, 'password-reset jobs to finish');
    const [rows] = await testApp.dataSource.query(`SELECT count(*)::int AS n FROM password_reset WHERE email = $1`, [
      unknown,
    ]);
    expect(rows.n).toBe(0);
  });

  it('refuses a forged or unknown token with a plain message', async () => {
    const answer = await expectStatus(
      testApp
        .browser()
        .post('/api/auth/password-reset/consume')
        .send({ token: 'A'.repeat(43), newPassword: 'a-brand-new-password' }),
      400,
      'LINK_INVALID',
    );
    expect(answer.message).toMatch(/ask for a new one/i);
  });
});
