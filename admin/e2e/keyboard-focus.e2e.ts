import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { adminUrl, openBrowser, screenshot, signIn, type BrowserSession } from './support/browser';

const journey = 'keyboard-focus';
const MAX_TABS = 80;

interface FocusStop {
  element: string;
  visible: boolean;
}

/** What has focus now and whether it shows a focus indicator: a drawn outline or a box-shadow (our focus ring). */
function focusStop(page: Page): Promise<FocusStop | null> {
  return page.evaluate(() => {
    const element = document.activeElement as HTMLElement | null;
    if (!element || element === document.body) return null;
    const style = getComputedStyle(element);
    const outline = style.outlineStyle !== 'none' && parseFloat(style.outlineWidth) > 0;
    const shadow = style.boxShadow !== 'none' && style.boxShadow !== '';
    const name = (element.getAttribute('aria-label') ?? element.textContent ?? element.getAttribute('name') ?? '')
      .trim()
      .replace(/\s+/g, ' ')
      .slice(0, 40);
    return {
      element: `${element.tagName.toLowerCase()}${element.id ? `#${element.id}` : ''} “${name}”`,
      visible: outline || shadow,
    };
  });
}

/** Tabs through the page from the top until focus comes round again, and lists every stop without a visible indicator. */
async function stopsWithoutFocusIndicator(page: Page, screen: string): Promise<string[]> {
  await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
  const seen = new Set<string>();
  const missing: string[] = [];
  let stops = 0;
  for (let i = 0; i < MAX_TABS; i++) {
    await page.keyboard.press('Tab');
    const stop = await focusStop(page);
    if (!stop) continue;
    const key = await page.evaluate(() => {
      const element = document.activeElement!;
      return Array.from(document.querySelectorAll('*')).indexOf(element);
    });
    if (seen.has(String(key))) break;
    seen.add(String(key));
    stops += 1;
    if (!stop.visible) missing.push(`${screen}: ${stop.element}`);
  }
  expect(stops, `${screen} has something to reach by keyboard`).toBeGreaterThan(2);
  return missing;
}

describe('every interactive element of the staff app shows where keyboard focus is', () => {
  let session: BrowserSession;

  beforeAll(async () => {
    session = await openBrowser();
  });
  afterAll(async () => {
    await session?.close();
  });

  it('draws a focus indicator on each stop when tabbing through the main screens', async () => {
    const { page } = session;
    await page.goto(`${adminUrl}/sign-in`);
    const missing = await stopsWithoutFocusIndicator(page, 'sign-in');
    await signIn(page, 'admin@evenhand.test');
    await page.getByRole('heading', { name: 'Staff', level: 1 }).waitFor();

    await page.goto(`${adminUrl}/studies`);
    await page
      .getByRole('link', { name: /Wayfinding cues/ })
      .first()
      .waitFor();
    await page
      .getByRole('link', { name: /Wayfinding cues/ })
      .first()
      .click();
    await page.waitForURL(/\/studies\/[0-9a-f-]{36}/);
    const studyPath = /\/studies\/[0-9a-f-]{36}/.exec(page.url())![0];

    const screens: Array<[string, string, RegExp]> = [
      ['staff', '/staff', /^Staff$/],
      ['studies', '/studies', /^Studies$/],
      ['audit trail', '/audit', /Audit trail/],
      ['your account', '/account', /^Your account$/],
      ['study set-up', `${studyPath}/setup`, /Wayfinding cues/],
      ['consent', `${studyPath}/consent`, /Wayfinding cues/],
      ['assignment', `${studyPath}/assignment`, /Wayfinding cues/],
      ['roster', `${studyPath}/roster`, /Wayfinding cues/],
      ['pay', `${studyPath}/pay`, /Wayfinding cues/],
    ];
    for (const [name, path, heading] of screens) {
      await page.goto(`${adminUrl}${path}`);
      await page.getByRole('heading', { name: heading, level: 1 }).first().waitFor();
      await page.waitForFunction(() => !document.querySelector('[aria-busy="true"]'));
      missing.push(...(await stopsWithoutFocusIndicator(page, name)));
    }
    await page.goto(`${adminUrl}/staff`);
    await page.getByRole('heading', { name: 'Staff', level: 1 }).waitFor();
    await page.keyboard.press('Tab');
    await page.keyboard.press('Tab');
    await screenshot(page, journey, 'focused-link');
    expect(missing).toEqual([]);
  });
});
