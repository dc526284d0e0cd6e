import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { adminUrl, openBrowser, phoneViewport, screenshot, signIn, type BrowserSession } from './support/browser';

const journey = 'phone-width';

/** How wide the page has become; anything over the viewport means the whole screen scrolls sideways. */
const pageWidth = (browser: BrowserSession) => browser.page.evaluate(() => document.documentElement.scrollWidth);

const studyTabs = [
  ['setup', 'Set-up'],
  ['assignment', 'Assignment'],
  ['consent', 'Consent'],
  ['roster', 'Roster'],
  ['watch', 'Dropout watch'],
  ['pay', 'Pay'],
] as const;

describe('the main staff pages fit a phone', () => {
  let browser: BrowserSession;

  beforeAll(async () => {
    browser = await openBrowser();
    await browser.page.setViewportSize(phoneViewport);
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('keeps Staff, Studies, a study’s tabs and Audit at 390 px, wide tables scrolling in their own frame', async () => {
    const { page } = browser;
    await page.goto(`${adminUrl}/sign-in`);
    await signIn(page, 'admin@evenhand.test');
    await page.getByRole('heading', { name: 'Staff', level: 1 }).waitFor();
    await page.getByRole('cell', { name: 'admin@evenhand.test' }).waitFor();
    await screenshot(page, journey, 'staff');
    expect(await pageWidth(browser)).toBeLessThanOrEqual(phoneViewport.width);
    // The table is wider than the phone and scrolls inside its frame instead.
    const frame = page.getByRole('table', { name: 'Staff accounts' }).locator('xpath=..');
    expect(await frame.evaluate((element) => element.scrollWidth > element.clientWidth)).toBe(true);

    await page.getByRole('link', { name: 'Studies', exact: true }).click();
    await page.getByRole('table', { name: 'Your studies' }).waitFor();
    await screenshot(page, journey, 'studies');
    expect(await pageWidth(browser)).toBeLessThanOrEqual(phoneViewport.width);

    await page.getByRole('link', { name: 'Wayfinding cues' }).first().click();
    await page.getByRole('heading', { name: 'Wayfinding cues', level: 1 }).waitFor();
    for (const [path, tab] of studyTabs) {
      const before = await page.locator('main').innerText();
      await page.getByRole('link', { name: tab, exact: true }).first().click();
      await page.waitForURL((url) => url.pathname.endsWith(`/${path}`));
      // The tab's own content has replaced the last one's (its code may still have been on its way).
      await expect.poll(() => page.locator('main').innerText(), { timeout: 30_000 }).not.toBe(before);
      // Measure the loaded page, tables included, not its loading state.
      await page.waitForLoadState('networkidle');
      await expect.poll(() => page.getByText(/^Loading/).count(), { timeout: 30_000 }).toBe(0);
      await screenshot(page, journey, `study-${path}`);
      expect(await pageWidth(browser), tab).toBeLessThanOrEqual(phoneViewport.width);
    }

    await page.getByRole('link', { name: 'Audit trail', exact: true }).click();
    await page.getByRole('heading', { level: 1 }).first().waitFor();
    await page.waitForLoadState('networkidle');
    await expect.poll(() => page.getByText(/^Loading/).count(), { timeout: 30_000 }).toBe(0);
    await screenshot(page, journey, 'audit');
    expect(await pageWidth(browser)).toBeLessThanOrEqual(phoneViewport.width);
  });
});
