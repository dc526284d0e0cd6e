import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import { adminUrl, openBrowser, screenshot, signIn, type BrowserSession } from './support/browser';

const journey = 'coordinator-shell';
const accessCookie = 'eh_access'; // the api's short-lived session cookie (api/src/common/auth/session-user.ts)

describe('a coordinator signs in on the staff site', () => {
  let browser: BrowserSession;

  beforeAll(async () => {
    browser = await openBrowser();
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('is sent to sign-in, sees the generic error for a wrong password, then lands in the shell with Studies and without Staff', async () => {
    const { page } = browser;

    await page.goto(`${adminUrl}/`);
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    expect(await page.getByText('Participants sign in on the').isVisible()).toBe(true);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'sign-in');

    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByText('Enter your e-mail address.').waitFor();
    await screenshot(page, journey, 'empty-form-errors');

    await signIn(page, 'coordinator@evenhand.test', 'not-the-password');
    const failure = page.getByRole('alert');
    await failure.waitFor();
    expect(await failure.textContent()).toMatch(/do not match/i);
    await screenshot(page, journey, 'wrong-password');

    await signIn(page, 'coordinator@evenhand.test');
    const nav = page.getByRole('navigation', { name: 'Main' });
    await nav.getByRole('link', { name: 'Studies' }).waitFor();
    await page.getByRole('heading', { name: 'Studies', level: 1 }).waitFor();
    expect(new URL(page.url()).pathname).toBe('/studies');
    expect(await nav.getByRole('link', { name: 'Staff' }).count()).toBe(0);
    expect(await page.getByRole('banner').getByText('Coordinator', { exact: true }).isVisible()).toBe(true);
    await page.getByRole('table', { name: 'Your studies' }).or(page.getByText('No studies yet')).waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'shell-studies');

    // An expired access cookie (15 minutes) must be renewed through POST /api/auth/refresh without a new sign-in.
    await browser.context.clearCookies({ name: accessCookie });
    await page.reload();
    await page.getByRole('heading', { name: 'Studies', level: 1 }).waitFor();
    expect((await browser.context.cookies()).some((cookie) => cookie.name === accessCookie)).toBe(true);

    await page.goto(`${adminUrl}/staff`);
    await page.getByText('Not part of your role').waitFor();
    await screenshot(page, journey, 'staff-refused');

    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
    await page.goto(`${adminUrl}/studies`);
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await screenshot(page, journey, 'signed-out');
  });
});
