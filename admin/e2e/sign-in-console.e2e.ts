import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { adminUrl, openBrowser, screenshotAtBothWidths, signIn, type BrowserSession } from './support/browser';

const journey = 'sign-in-console';

describe('the sign-in page keeps the browser console clean', () => {
  let browser: BrowserSession;
  const problems: string[] = [];

  beforeAll(async () => {
    browser = await openBrowser();
    browser.page.on('console', (message) => {
      if (message.type() === 'error') problems.push(`console: ${message.text()}`);
    });
    browser.page.on('pageerror', (error) => problems.push(`page error: ${error.message}`));
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('is reached from a protected page, refuses a wrong password and signs in without a console error', async () => {
    const { page } = browser;
    // Signed out on a protected page: the shell sends the person to sign in (the way the update loop showed, in
    // development builds; src/app/sign-in-console.test.tsx holds React's development checks to it).
    await page.goto(`${adminUrl}/studies`);
    await page.getByRole('heading', { name: 'Sign in', level: 1 }).waitFor();
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await page.getByLabel('E-mail').click();
    await page.getByLabel('Password').click();
    await screenshotAtBothWidths(page, journey, 'empty');

    // The api answers 401 for the wrong password; the browser logs the failed request itself, which is not ours.
    const ownProblems = () => problems.filter((problem) => !problem.includes('401'));
    await signIn(page, 'coordinator@evenhand.test', 'not-the-password');
    await page.getByText(/e-mail and password do not match/).waitFor();
    await screenshotAtBothWidths(page, journey, 'wrong-password');
    expect(ownProblems()).toEqual([]);

    await signIn(page, 'coordinator@evenhand.test');
    await page.getByRole('heading', { name: 'Studies', level: 1 }).waitFor();
    expect(ownProblems()).toEqual([]);
  });
});
