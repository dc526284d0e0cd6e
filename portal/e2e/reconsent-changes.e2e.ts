import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import { launchBrowser, type JourneyBrowser } from './support/browser';
import { e2eEnv } from './support/env';
import { sidewaysOverflow } from './support/keyboard-focus';
import { messagesTo, signInLinkIn, waitForMessageTo } from './support/mailbox';
import { screenshotTaker } from './support/screenshots';

/**
 * The demo study's amendment (a note added to "What the study is about…") was activated after everyone signed; the
 * last demo participants have not signed it yet. This one is only looked at, never signed, so other journeys keep them.
 */
const studySlug = 'wayfinding-cues';
const waitingToResign = 'p048@evenhand.test';

describe('someone asked to sign a new consent version sees what changed', () => {
  const shoot = screenshotTaker('reconsent-changes');
  const browsers: JourneyBrowser[] = [];

  beforeAll(async () => {
    browsers.push(await launchBrowser('phone'), await launchBrowser('desktop'));
  });
  afterAll(async () => {
    for (const browser of browsers) await browser.close();
  });

  it('lists the change since the version they signed above the new form, on a phone and a desktop', async () => {
    for (const [index, { page }] of browsers.entries()) {
      const size = index === 0 ? 'phone' : 'desktop';
      const earlier = (await messagesTo(waitingToResign)).length;
      await page.goto(`${e2eEnv.portalUrl}/s/${studySlug}`);
      await page
        .getByRole('link', { name: /Take part|Sign in/ })
        .first()
        .click();
      await page.getByLabel('Your e-mail address').fill(waitingToResign);
      await page.getByRole('button', { name: 'Send me a sign-in link' }).click();
      await page.getByRole('heading', { name: 'Check your inbox' }).waitFor();
      // Each window asks for its own link: wait for the message this request sent.
      await expect
        .poll(async () => (await messagesTo(waitingToResign)).length, { timeout: 30_000 })
        .toBeGreaterThan(earlier);
      const message = await waitForMessageTo(waitingToResign, { subject: /sign-in link/ });
      const link = signInLinkIn(message);
      await page.goto(`${e2eEnv.portalUrl}${link.pathname}${link.search}`);
      await page.waitForURL(`**/s/${studySlug}`);

      await page.getByText('The consent form has changed').waitFor();
      await page.getByText('What changed since you signed:').waitFor();
      expect(await page.getByText('Reworded: “What the study is about and what you will do”.').isVisible()).toBe(true);
      expect(await seriousAccessibilityProblems(page)).toEqual([]);
      expect(await sidewaysOverflow(page)).toBe(0);
      await shoot(page, `what-changed-${size}`);
    }
  });
});
