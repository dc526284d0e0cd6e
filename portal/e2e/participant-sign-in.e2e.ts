import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import { launchPhoneBrowser, type PhoneBrowser } from './support/browser';
import { e2eEnv } from './support/env';
import { signInLinkIn, waitForMessageTo } from './support/mailbox';
import { screenshotTaker } from './support/screenshots';

describe('participant signs in by e-mailed link', () => {
  let browser: PhoneBrowser;
  const shoot = screenshotTaker('participant-sign-in');
  // Unique per run, so the mailbox match cannot pick up another run's message.
  const email = `participant.${Date.now()}.${Math.random().toString(36).slice(2, 8)}@example.test`;

  beforeAll(async () => {
    browser = await launchPhoneBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('requests a link, opens it from the mailbox, lands on "Your studies", then signs out', async () => {
    const { page } = browser;

    await page.goto(`${e2eEnv.portalUrl}/studies`);
    // The guard sends someone without a session to the e-mail sign-in.
    await page.getByRole('heading', { name: 'Sign in with your e-mail' }).waitFor();
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'enter-email');

    await page.getByRole('button', { name: 'Send me a sign-in link' }).click();
    await page.getByText('Enter your e-mail address.').waitFor();
    await shoot(page, 'empty-address-error');

    await page.getByLabel('Your e-mail address').fill(email);
    await page.getByRole('button', { name: 'Send me a sign-in link' }).click();
    await page.getByRole('heading', { name: 'Check your inbox' }).waitFor();
    expect(await page.getByText(email).isVisible()).toBe(true);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'check-inbox');

    const message = await waitForMessageTo(email);
    const link = signInLinkIn(message);
    expect(link.pathname).toBe('/sign-in/link');
    expect(link.searchParams.get('token')).toMatch(/.{16,}/);
    // Opened on the portal under test, wherever the api thinks the portal lives.
    const linkOnPortal = `${e2eEnv.portalUrl}${link.pathname}${link.search}`;

    await page.goto(linkOnPortal);
    await page.getByRole('heading', { name: 'Your studies' }).waitFor();
    expect(new URL(page.url()).pathname).toBe('/studies');
    await page.getByRole('heading', { name: 'No studies yet' }).waitFor();
    expect(await page.getByText(email).isVisible()).toBe(true);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'your-studies-signed-in');

    // Still signed in after a reload: the session lives in cookies, not in page memory.
    await page.reload();
    await page.getByRole('heading', { name: 'Your studies' }).waitFor();

    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.getByText('You have signed out.').waitFor();
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await shoot(page, 'signed-out');

    await page.goto(`${e2eEnv.portalUrl}/studies`);
    await page.getByRole('heading', { name: 'Sign in with your e-mail' }).waitFor();

    // The same link a second time: refused, with a way to ask for a new one.
    await page.goto(linkOnPortal);
    await page.getByRole('heading', { name: 'This sign-in link can no longer be used' }).waitFor();
    expect(await page.getByRole('link', { name: 'Send me a new sign-in link' }).isVisible()).toBe(true);
    await shoot(page, 'used-link-refused');

    await page.goto(`${e2eEnv.portalUrl}/no-such-page`);
    await page.getByRole('heading', { name: 'We could not find that page' }).waitFor();
    await shoot(page, 'not-found');
  });
});
