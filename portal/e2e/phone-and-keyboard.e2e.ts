import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, type JourneyBrowser } from './support/browser';
import { e2eEnv } from './support/env';
import { placeInWindow, sidewaysOverflow, stopsWithoutVisibleFocus } from './support/keyboard-focus';
import { signInLinkIn, waitForMessageTo } from './support/mailbox';
import { answerScreeningQuestion, type ScreeningQuestion } from './support/screening';
import { screenshotTaker } from './support/screenshots';
import { pageApi } from './support/take-part';

/** The recruiting demo study with an active consent version, seeded by the api's demo scenario. */
const studySlug = 'wayfinding-cues';

/**
 * Every portal screen at phone width (390 px), walked by keyboard: each screen gets a screenshot, nothing sticks out
 * sideways, and every Tab stop shows the focus outline. Signing by keyboard ends with the confirmation and the
 * assigned instructions in view and focused; the screening page opens at its heading.
 */
describe('every portal screen on a phone and by keyboard', () => {
  let browser: JourneyBrowser;
  const shoot = screenshotTaker('phone-and-keyboard');
  const email = `keyboard.${Date.now()}.${Math.random().toString(36).slice(2, 8)}@example.test`;

  beforeAll(async () => {
    browser = await launchBrowser('phone');
  });
  afterAll(async () => {
    await browser?.close();
  });

  /** The checks every screen gets: a screenshot, no sideways overflow, a visible outline at every Tab stop. */
  async function checkScreen(name: string, { fullPage = true, minStops = 1, page = browser.page } = {}) {
    await shoot(page, name, { fullPage });
    expect(await sidewaysOverflow(page), `${name}: the page is wider than the phone`).toBeLessThanOrEqual(0);
    const { stops, missing } = await stopsWithoutVisibleFocus(page);
    expect(stops, `${name}: Tab reached fewer stops than expected`).toBeGreaterThanOrEqual(minStops);
    expect(missing, `${name}: Tab stops without a visible focus outline`).toEqual([]);
  }

  it('walks from the study link through signing, the steps, stopping, and the other screens', async () => {
    const { page } = browser;
    expect(page.viewportSize()?.width).toBe(390);

    // The public study page, signed out.
    await page.goto(`${e2eEnv.portalUrl}/s/${studySlug}`);
    await page.getByRole('heading', { level: 1, name: 'Wayfinding cues' }).waitFor();
    await checkScreen('study-page', { minStops: 3 });

    // A study that does not exist.
    await page.goto(`${e2eEnv.portalUrl}/s/no-such-study`);
    await page.getByRole('heading', { name: 'We could not find this study' }).waitFor();
    await checkScreen('study-not-found', { minStops: 2 });

    // A page that does not exist.
    await page.goto(`${e2eEnv.portalUrl}/nowhere`);
    await page.getByRole('heading', { level: 1 }).waitFor();
    await checkScreen('not-found');

    // A malformed sign-in link says so in plain words.
    await page.goto(`${e2eEnv.portalUrl}/sign-in/link?token=abc`);
    await page.getByRole('heading', { name: 'This sign-in link is not complete' }).waitFor();
    expect(await page.getByText(/token/i).count()).toBe(0);
    await checkScreen('sign-in-link-malformed', { minStops: 2 });

    // Sign in from the study, by keyboard.
    await page.goto(`${e2eEnv.portalUrl}/sign-in?study=${studySlug}`);
    await page.getByLabel('Your e-mail address').waitFor();
    await checkScreen('sign-in', { minStops: 2 });
    await page.getByLabel('Your e-mail address').fill('not-an-address');
    await page.keyboard.press('Tab');
    await page.getByText('Enter an e-mail address like name@example.com.').waitFor();
    await shoot(page, 'sign-in-field-checked-on-leaving');
    await page.getByLabel('Your e-mail address').fill(email);
    await page.getByLabel('Your e-mail address').press('Enter');
    await page.getByRole('heading', { name: 'Check your inbox' }).waitFor();
    await checkScreen('check-inbox');
    const link = signInLinkIn(await waitForMessageTo(email));
    await page.goto(`${e2eEnv.portalUrl}${link.pathname}${link.search}`);
    await page.waitForURL(`**/s/${studySlug}`);
    await page.getByText(email).waitFor();
    await checkScreen('study-page-signed-in', { minStops: 3 });

    // "Take part" sits at the foot of a long page; the questions must open at their heading, not scrolled past it.
    const takePart = page.getByRole('button', { name: 'Take part' });
    await takePart.focus();
    await page.keyboard.press('Enter');
    await page.getByRole('heading', { name: 'A few questions first' }).waitFor();
    await expect.poll(async () => (await placeInWindow(page, '#screening-heading')).top).toBeGreaterThanOrEqual(0);
    const screeningHeading = await placeInWindow(page, '#screening-heading');
    expect(screeningHeading.bottom).toBeLessThanOrEqual(screeningHeading.windowHeight);
    expect(await page.evaluate(() => window.scrollY)).toBe(0);
    await shoot(page, 'screening-opens-at-heading', { fullPage: false });
    await checkScreen('screening', { minStops: 4 });

    const studyId = (await pageApi<{ id: string }>(page, `/api/public/studies/${studySlug}`)).id;
    const enrollment = await pageApi<{ screening: { questions: ScreeningQuestion[] } }>(
      page,
      `/api/studies/${studyId}/enrollments/me`,
    );
    for (const question of enrollment.screening.questions) await answerScreeningQuestion(page, question);
    await page.getByRole('button', { name: 'Save my answers' }).press('Enter');

    // The consent form, read by keyboard.
    await page.getByText('Start here: the key points').waitFor();
    await checkScreen('consent-key-information', { minStops: 2 });
    await page.getByRole('button', { name: 'Read the full form' }).press('Enter');
    await page.getByText('The full consent form').waitFor();
    await checkScreen('consent-section', { minStops: 3 });
    for (let section = 0; section < 40; section += 1) {
      const next = page.getByRole('button', { name: /^(Next: .+|Continue to signing)$/ });
      const label = await next.textContent();
      await next.press('Enter');
      if (label === 'Continue to signing') break;
    }
    await page.getByRole('heading', { name: 'Sign the consent form' }).waitFor();
    await checkScreen('signature', { minStops: 4 });

    // Sign by keyboard: Enter in the name field.
    await page.getByLabel('Your full name').fill('Robin Ash');
    await page.getByLabel('Your full name').press('Enter');
    const confirmation = page.getByRole('heading', { name: 'You have signed the consent form' });
    await confirmation.waitFor();
    await expect.poll(() => page.evaluate(() => document.activeElement?.id)).toBe('signed-heading');
    await expect.poll(async () => (await placeInWindow(page, '#signed-heading')).top).toBeGreaterThanOrEqual(0);
    const heading = await placeInWindow(page, '#signed-heading');
    expect(heading.bottom).toBeLessThanOrEqual(heading.windowHeight);
    // The assigned instructions follow straight under it, on screen too.
    const instructions = await placeInWindow(page, '#your-condition-heading');
    expect(instructions.top).toBeGreaterThanOrEqual(0);
    expect(instructions.bottom).toBeLessThanOrEqual(instructions.windowHeight);
    await shoot(page, 'signed-confirmation-in-view', { fullPage: false });

    // The steps, with the signed form once it is made.
    await page.getByRole('link', { name: 'Download your signed form (PDF)' }).waitFor({ timeout: 30_000 });
    await checkScreen('steps', { minStops: 4 });

    // Stopping: the counter says by how many a reason is too long, and the withdrawn page keeps the signed form.
    await page.getByRole('button', { name: 'Stop taking part' }).press('Enter');
    const reason = page.getByLabel('Would you like to tell us why? (optional)');
    await reason.fill('a'.repeat(1200));
    await page.getByText(/200 characters too many/).waitFor();
    await reason.press('Tab');
    await page.getByText('Please keep your reason to 1000 characters or fewer.').waitFor();
    await shoot(page, 'withdraw-reason-too-long', { fullPage: false });
    expect(await sidewaysOverflow(page)).toBeLessThanOrEqual(0);
    await reason.fill('My weeks have become too busy.');
    await page.getByRole('button', { name: 'Yes, stop taking part' }).press('Enter');
    await page.getByRole('heading', { name: 'You have stopped taking part' }).waitFor();
    const keptCopy = page.getByRole('link', { name: 'Download your signed form (PDF)' });
    await keptCopy.waitFor({ timeout: 30_000 });
    const [download] = await Promise.all([page.waitForEvent('download'), keptCopy.click()]);
    expect(download.suggestedFilename()).toMatch(/^signed-consent-.+\.pdf$/);
    await checkScreen('withdrawn', { minStops: 3 });

    // "Your studies" says this study was stopped, not that it is running.
    await page.goto(`${e2eEnv.portalUrl}/studies`);
    const card = page.getByRole('listitem').filter({ has: page.getByRole('link', { name: 'Wayfinding cues' }) });
    await card.getByText('You stopped taking part').waitFor();
    await checkScreen('your-studies', { minStops: 3 });

    // Getting paid.
    await page.getByRole('link', { name: 'Getting paid' }).click();
    await page.getByRole('heading', { level: 1, name: 'Getting paid' }).waitFor();
    await checkScreen('getting-paid', { minStops: 3 });

    // The return page without its address parts.
    await page.goto(`${e2eEnv.portalUrl}/return`);
    await page.getByRole('heading', { level: 1 }).waitFor();
    await checkScreen('task-return-incomplete');
  });

  it('shows the signed-out screens with the same focus outline in a desktop window', async () => {
    const desktop = await launchBrowser('desktop');
    try {
      const { page } = desktop;
      await page.goto(`${e2eEnv.portalUrl}/s/${studySlug}`);
      await page.getByRole('heading', { level: 1, name: 'Wayfinding cues' }).waitFor();
      await checkScreen('desktop-study-page', { minStops: 3, page });
      await page.goto(`${e2eEnv.portalUrl}/sign-in?study=${studySlug}`);
      await page.getByLabel('Your e-mail address').waitFor();
      await checkScreen('desktop-sign-in', { minStops: 2, page });
      await page.goto(`${e2eEnv.portalUrl}/sign-in/link?token=abc`);
      await page.getByRole('heading', { name: 'This sign-in link is not complete' }).waitFor();
      await checkScreen('desktop-sign-in-link-malformed', { minStops: 2, page });
    } finally {
      await desktop.close();
    }
  });
});
