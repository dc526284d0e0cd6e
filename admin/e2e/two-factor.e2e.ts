import { generate } from 'otplib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import { adminUrl, openBrowser, screenshotAtBothWidths, signIn, type BrowserSession } from './support/browser';

const journey = 'two-factor';

/** What the authenticator app on the person's phone would show, `stepsAhead` 30-second steps from now (otplib). */
const appCode = (secret: string, stepsAhead = 0) =>
  generate({ secret, epoch: Math.floor(Date.now() / 1000) + 30 * stepsAhead });

describe('an admin turns on two-factor sign-in, then signs in with a code and with a recovery code', () => {
  let labAdmin: BrowserSession;
  let newAdmin: BrowserSession;

  beforeAll(async () => {
    labAdmin = await openBrowser();
    newAdmin = await openBrowser();
  });

  afterAll(async () => {
    // Whatever happened above, the lab-wide requirement must not outlive this journey: other journeys sign in as admin.
    await newAdmin?.page.request
      .patch(`${adminUrl}/api/lab-settings`, {
        data: { twoFactorRequiredForAdmins: false },
        headers: { Origin: adminUrl },
      })
      .catch(() => undefined);
    await labAdmin?.close();
    await newAdmin?.close();
  });

  it('sets up with the QR code’s key, requires it of admins for a while, and signs in with a code and with a recovery code', async () => {
    const stamp = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`;
    const email = `tfa-${stamp}@evenhand.test`;
    const name = `Ines Twofold ${stamp}`;
    const password = 'two-factor-journey-1';

    const lab = labAdmin.page;
    await lab.goto(`${adminUrl}/sign-in`);
    await signIn(lab, 'admin@evenhand.test');
    await lab.getByRole('heading', { name: 'Staff', level: 1 }).waitFor();
    await lab.getByRole('button', { name: 'Add staff member' }).first().click();
    const createDialog = lab.getByRole('dialog');
    await createDialog.getByLabel('Name', { exact: true }).fill(name);
    await createDialog.getByLabel('E-mail', { exact: true }).fill(email);
    await createDialog.getByRole('button', { name: /^Role/ }).click();
    await lab.getByRole('option', { name: /^Admin/ }).click();
    await createDialog.getByLabel('Temporary password').fill(password);
    await createDialog.getByRole('button', { name: 'Add staff member' }).click();
    await lab.getByText(`${name} was added as admin.`).waitFor();

    const page = newAdmin.page;
    await page.goto(`${adminUrl}/sign-in`);
    await signIn(page, email, password);
    await page.getByRole('link', { name: 'Your account' }).click();
    await page.getByRole('heading', { name: 'Your account', level: 1 }).waitFor();
    await page.getByRole('button', { name: 'Set up two-factor sign-in' }).click();
    await page.getByRole('img', { name: 'QR code for your authenticator app' }).waitFor();
    const secret = ((await page.getByTestId('two-factor-key').textContent()) ?? '').replace(/\s+/g, '');
    expect(secret).toMatch(/^[A-Z2-7]{32}$/);
    await screenshotAtBothWidths(page, journey, 'qr-code');

    const form = page.getByRole('form', { name: 'Confirm two-factor sign-in' });
    const current = await appCode(secret);
    await form.getByLabel('Code from your authenticator app').fill(current === '000000' ? '111111' : '000000');
    await form.getByRole('button', { name: 'Turn on two-factor sign-in' }).click();
    await form.getByText('That code does not match. Enter the newest code your app shows.').waitFor();
    await form.getByLabel('Code from your authenticator app').fill(await appCode(secret));
    await form.getByRole('button', { name: 'Turn on two-factor sign-in' }).click();
    const codeList = page.getByRole('list', { name: 'Recovery codes' });
    await codeList.waitFor();
    const recoveryCodes = (await codeList.getByRole('listitem').allTextContents()).map((code) => code.trim());
    expect(recoveryCodes).toHaveLength(10);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshotAtBothWidths(page, journey, 'recovery-codes');
    await page.getByRole('button', { name: 'I have saved them' }).click();
    await page.getByText('10 recovery codes are left.').waitFor();
    await screenshotAtBothWidths(page, journey, 'on');

    // The lab setting: this admin requires it of every admin; the demo admin, without it, is held to their account page.
    await page.getByRole('link', { name: 'Staff', exact: true }).click();
    const requirement = page.getByRole('switch', { name: 'Require two-factor sign-in for admins' });
    await requirement.click();
    await expect.poll(() => requirement.getAttribute('aria-checked')).toBe('true');
    await screenshotAtBothWidths(page, journey, 'lab-setting-on');
    await lab.goto(`${adminUrl}/studies`);
    await lab.reload();
    await lab.getByText('The lab requires admins to sign in with a two-factor code. Set it up below').waitFor();
    expect(new URL(lab.url()).pathname).toBe('/account');
    await screenshotAtBothWidths(lab, journey, 'held-to-set-up');
    await requirement.click();
    await expect.poll(() => requirement.getAttribute('aria-checked')).toBe('false');

    // Sign out, and back in with the password and then a code from the app.
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
    await signIn(page, email, password);
    const codeField = page.getByLabel('Code from your authenticator app');
    await codeField.waitFor();
    await screenshotAtBothWidths(page, journey, 'asks-for-code');
    // The code that turned it on counts as used, so the app's next code signs in.
    await codeField.fill(await appCode(secret, 1));
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('heading', { name: 'Staff', level: 1 }).waitFor();

    // Phone lost: a recovery code instead, which then works no more.
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
    await signIn(page, email, password);
    await page.getByRole('button', { name: 'Use a recovery code instead' }).click();
    await page.getByLabel('Recovery code').fill(recoveryCodes[0]!);
    await screenshotAtBothWidths(page, journey, 'recovery-code');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('heading', { name: 'Staff', level: 1 }).waitFor();
    await page.getByRole('link', { name: 'Your account' }).click();
    await page.getByText('9 recovery codes are left.').waitFor();

    await page.getByRole('button', { name: 'Sign out' }).click();
    await signIn(page, email, password);
    await page.getByRole('button', { name: 'Use a recovery code instead' }).click();
    await page.getByLabel('Recovery code').fill(recoveryCodes[0]!);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByText('That recovery code is not right, or it was used already.').waitFor();
    await screenshotAtBothWidths(page, journey, 'recovery-code-used');
  });
});
