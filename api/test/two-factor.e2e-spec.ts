import { generate } from 'otplib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { expectStatus } from './support/http';
import { uniqueAddress } from './support/mailbox';
import { Browser, signedInStaff } from './support/study-fixtures';
import { startTestApp, TestApp } from './support/test-app';

let testApp: TestApp;
let admin: Browser;

beforeAll(async () => {
  testApp = await startTestApp();
  admin = await signedInStaff(testApp, 'admin');
});
afterAll(async () => {
  await testApp?.dataSource.query(`UPDATE lab_setting SET two_factor_required_for_admins = false`);
  await testApp?.close();
});

/** The authenticator app's code, `stepsAhead` 30-second steps from now (otplib, as a phone would compute it). */
const codeFor = (secret: string, stepsAhead = 0) =>
  generate({ secret, epoch: Math.floor(Date.now() / 1000) + 30 * stepsAhead });

const PASSWORD = 'two-factor-password-1';

async function newStaff(role: 'admin' | 'coordinator'): Promise<{ email: string; browser: Browser }> {
  const email = uniqueAddress('tfa');
  await expectStatus(admin.post('/api/users').send({ email, name: 'Tove Factor', role, password: PASSWORD }), 201);
  const browser = testApp.browser();
  await expectStatus(browser.post('/api/auth/sign-in').send({ email, password: PASSWORD }), 200);
  return { email, browser };
}

async function withTwoFactor(role: 'admin' | 'coordinator') {
  const staff = await newStaff(role);
  const setup = await expectStatus(staff.browser.post('/api/auth/two-factor/setup'), 200);
  const confirmedWith = await codeFor(setup.secret);
  const { recoveryCodes } = await expectStatus(
    staff.browser.post('/api/auth/two-factor/confirm').send({ code: confirmedWith }),
    200,
  );
  return { ...staff, secret: setup.secret as string, confirmedWith, recoveryCodes: recoveryCodes as string[] };
}

const actions = async (email: string) =>
  (await testApp.dataSource.query(
    `SELECT action, data FROM audit_event WHERE chain = 'lab' AND (actor_email = $1 OR subject_id = $1 OR data->>'email' = $1) ORDER BY sequence`,
    [email],
  )) as Array<{
    action: string;
    data: Record<string, unknown>;
  }>;

describe('setting up two-factor sign-in', () => {
  it('offers a QR code, turns on only with a right code, keeps the secret encrypted and never returns it again', async () => {
    const { email, browser } = await newStaff('coordinator');
    expect(await expectStatus(browser.get('/api/auth/two-factor'), 200)).toEqual({
      enabled: false,
      enabledAt: null,
      recoveryCodesLeft: 0,
      required: false,
    });
    const setup = await expectStatus(browser.post('/api/auth/two-factor/setup'), 200);
    expect(setup.secret).toMatch(/^[A-Z2-7]{32}$/);
    expect(setup.otpauthUrl).toContain(`secret=${setup.secret}`);
    expect(setup.qrCodeDataUrl).toMatch(/^data:image\/svg\+xml;base64,/);
    expect(Buffer.from(setup.qrCodeDataUrl.split(',')[1], 'base64').toString()).toContain('<svg');

    const wrong = await expectStatus(
      browser
        .post('/api/auth/two-factor/confirm')
        .send({ code: '000000' === (await codeFor(setup.secret)) ? '111111' : '000000' }),
      400,
      'VALIDATION_FAILED',
    );
    expect(wrong.errors).toEqual([expect.objectContaining({ field: 'code' })]);
    const malformed = await expectStatus(
      browser.post('/api/auth/two-factor/confirm').send({ code: '12ab' }),
      400,
      'VALIDATION_FAILED',
    );
    expect(malformed.errors[0].field).toBe('code');

    const { recoveryCodes } = await expectStatus(
      browser.post('/api/auth/two-factor/confirm').send({ code: await codeFor(setup.secret) }),
      200,
    );
    expect(recoveryCodes).toHaveLength(10);
    const status = await expectStatus(browser.get('/api/auth/two-factor'), 200);
    expect(status).toMatchObject({ enabled: true, recoveryCodesLeft: 10 });
    expect(JSON.stringify(status)).not.toContain(setup.secret);
    expect((await expectStatus(browser.get('/api/auth/me'), 200)).twoFactorEnabled).toBe(true);

    const [stored] = await testApp.dataSource.query(
      `SELECT two_factor_secret, two_factor_pending_secret FROM user_account WHERE email = $1`,
      [email],
    );
    expect(stored.two_factor_secret).toMatch(/^v1\./);
    expect(stored.two_factor_secret).not.toContain(setup.secret);
    expect(stored.two_factor_pending_secret).toBeNull();
    const hashes = await testApp.dataSource.query(
      `SELECT c.code_hash FROM two_factor_recovery_code c JOIN user_account u ON u.id = c.user_id WHERE u.email = $1`,
      [email],
    );
    expect(hashes).toHaveLength(10);
    expect(JSON.stringify(hashes)).not.toContain(recoveryCodes[0]);

    await expectStatus(browser.post('/api/auth/two-factor/setup'), 409, 'TWO_FACTOR_ALREADY_ON');
    expect((await actions(email)).map((event) => event.action)).toContain('auth.two-factor-enabled');
  });
});

describe('signing in with two-factor on', () => {
  it('asks for the code after the password, refuses a wrong or reused code, and accepts each recovery code once', async () => {
    const { email, secret, confirmedWith, recoveryCodes } = await withTwoFactor('coordinator');
    const fresh = () => testApp.browser();

    const asked = await expectStatus(
      fresh().post('/api/auth/sign-in').send({ email, password: PASSWORD }),
      401,
      'TWO_FACTOR_REQUIRED',
    );
    expect(asked.message).toMatch(/6-digit code/);
    // A wrong password still gets the generic answer, code or not: the code is asked only after a right password.
    await expectStatus(
      fresh()
        .post('/api/auth/sign-in')
        .send({ email, password: 'wrong-password-1', code: await codeFor(secret) }),
      401,
      'INVALID_CREDENTIALS',
    );

    const current = await codeFor(secret);
    const wrongCode = [current, confirmedWith].includes('123456') ? '654321' : '123456';
    const wrong = await expectStatus(
      fresh().post('/api/auth/sign-in').send({ email, password: PASSWORD, code: wrongCode }),
      401,
      'TWO_FACTOR_INVALID',
    );
    expect(wrong.message).toMatch(/code is not right/);
    // The code that confirmed the set-up has been used. (Not the code of "now": a 30-second step may have begun
    // since the set-up, and a new step's code is rightly accepted.)
    await expectStatus(
      fresh().post('/api/auth/sign-in').send({ email, password: PASSWORD, code: confirmedWith }),
      401,
      'TWO_FACTOR_INVALID',
    );

    const next = await codeFor(secret, 1);
    const signedIn = fresh();
    const session = await expectStatus(
      signedIn.post('/api/auth/sign-in').send({ email, password: PASSWORD, code: next }),
      200,
    );
    expect(session.user.twoFactorEnabled).toBe(true);
    await expectStatus(signedIn.get('/api/auth/me'), 200);
    await expectStatus(
      fresh().post('/api/auth/sign-in').send({ email, password: PASSWORD, code: next }),
      401,
      'TWO_FACTOR_INVALID',
    );

    await expectStatus(
      fresh()
        .post('/api/auth/sign-in')
        .send({ email, password: PASSWORD, recoveryCode: recoveryCodes[3].toUpperCase() }),
      200,
    );
    const reused = await expectStatus(
      fresh().post('/api/auth/sign-in').send({ email, password: PASSWORD, recoveryCode: recoveryCodes[3] }),
      401,
      'TWO_FACTOR_INVALID',
    );
    expect(reused.message).toMatch(/recovery code/);
    expect((await expectStatus(signedIn.get('/api/auth/two-factor'), 200)).recoveryCodesLeft).toBe(9);

    const events = await actions(email);
    expect(events.filter((e) => e.action === 'auth.recovery-code-used').map((e) => e.data.recoveryCodesLeft)).toEqual([
      9,
    ]);
    expect(events.filter((e) => e.action === 'auth.sign-in-failed').map((e) => e.data.method)).toEqual([
      'password',
      'two-factor-code',
      'two-factor-code',
      'two-factor-code',
      'recovery-code',
    ]);
    expect(events.filter((e) => e.action === 'auth.signed-in').map((e) => e.data.secondFactor ?? null)).toEqual([
      null,
      'code',
      'recovery-code',
    ]);
  });

  it('counts wrong codes against the same sign-in limit as wrong passwords', async () => {
    const { email } = await withTwoFactor('coordinator');
    const limited = await startTestApp({
      SIGN_IN_LIMIT: '3',
      SIGN_IN_CLIENT_LIMIT: '50',
      SIGN_IN_WINDOW_SECONDS: '60',
    });
    try {
      await limited.dataSource.query(`DELETE FROM rate_limit_window`);
      const statuses: number[] = [];
      for (let i = 0; i < 5; i++) {
        statuses.push(
          (
            await limited
              .browser()
              .post('/api/auth/sign-in')
              .send({ email, password: PASSWORD, code: `00000${i}` })
          ).status,
        );
      }
      expect(statuses).toEqual([401, 401, 401, 429, 429]);
    } finally {
      await limited.dataSource.query(`DELETE FROM rate_limit_window`);
      await limited.close();
    }
  });

  it('turns off only with the password, and then the password alone signs in', async () => {
    const { email, browser } = await withTwoFactor('coordinator');
    const wrong = await expectStatus(
      browser.delete('/api/auth/two-factor').send({ password: 'not-my-password' }),
      400,
      'VALIDATION_FAILED',
    );
    expect(wrong.errors[0].field).toBe('password');
    await expectStatus(browser.delete('/api/auth/two-factor').send({ password: PASSWORD }), 204);
    await expectStatus(testApp.browser().post('/api/auth/sign-in').send({ email, password: PASSWORD }), 200);
    const [left] = await testApp.dataSource.query(
      `SELECT count(*)::int AS n FROM two_factor_recovery_code c JOIN user_account u ON u.id = c.user_id WHERE u.email = $1`,
      [email],
    );
    expect(left.n).toBe(0);
    expect((await actions(email)).map((e) => e.action)).toContain('auth.two-factor-disabled');
  });
});

describe('the lab requiring two-factor sign-in of admins', () => {
  it('needs the switching admin’s own two-factor, then holds other admins to their account page until they set it up', async () => {
    const refused = await expectStatus(
      admin.patch('/api/lab-settings').send({ twoFactorRequiredForAdmins: true }),
      409,
      'TWO_FACTOR_OFF',
    );
    expect(refused.errors[0].field).toBe('twoFactorRequiredForAdmins');
    await expectStatus(
      admin.patch('/api/lab-settings').send({ twoFactorRequiredForAdmins: 'yes' }),
      400,
      'VALIDATION_FAILED',
    );

    const keeper = await withTwoFactor('admin');
    const otherAdmin = await newStaff('admin');
    const coordinator = await newStaff('coordinator');
    try {
      expect(
        await expectStatus(keeper.browser.patch('/api/lab-settings').send({ twoFactorRequiredForAdmins: true }), 200),
      ).toMatchObject({ twoFactorRequiredForAdmins: true });
      await expectStatus(
        coordinator.browser.patch('/api/lab-settings').send({ twoFactorRequiredForAdmins: false }),
        403,
        'FORBIDDEN',
      );

      const blocked = await expectStatus(otherAdmin.browser.get('/api/studies'), 403, 'TWO_FACTOR_SETUP_REQUIRED');
      expect(blocked.message).toMatch(/Your account/);
      expect((await expectStatus(otherAdmin.browser.get('/api/auth/me'), 200)).twoFactorSetupNeeded).toBe(true);
      expect((await expectStatus(otherAdmin.browser.get('/api/auth/two-factor'), 200)).required).toBe(true);
      await expectStatus(coordinator.browser.get('/api/studies'), 200);
      await expectStatus(keeper.browser.get('/api/studies'), 200);
      await expectStatus(
        keeper.browser.delete('/api/auth/two-factor').send({ password: PASSWORD }),
        409,
        'TWO_FACTOR_REQUIRED_BY_LAB',
      );

      const setup = await expectStatus(otherAdmin.browser.post('/api/auth/two-factor/setup'), 200);
      await expectStatus(
        otherAdmin.browser.post('/api/auth/two-factor/confirm').send({ code: await codeFor(setup.secret) }),
        200,
      );
      await expectStatus(otherAdmin.browser.get('/api/studies'), 200);
      expect((await expectStatus(otherAdmin.browser.get('/api/auth/me'), 200)).twoFactorSetupNeeded).toBe(false);
    } finally {
      await expectStatus(keeper.browser.patch('/api/lab-settings').send({ twoFactorRequiredForAdmins: false }), 200);
    }
    const changes = await testApp.dataSource.query(
      `SELECT data FROM audit_event WHERE action = 'lab.two-factor-requirement-changed' AND actor_id = (SELECT id FROM user_account WHERE email = $1) ORDER BY sequence`,
      [keeper.email],
    );
    expect(
      changes.map((c: { data: { twoFactorRequiredForAdmins: boolean } }) => c.data.twoFactorRequiredForAdmins),
    ).toEqual([true, false]);
  });
});
