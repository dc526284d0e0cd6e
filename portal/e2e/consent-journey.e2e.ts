import { readFile } from 'node:fs/promises';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import { launchPhoneBrowser, type PhoneBrowser } from './support/browser';
import { e2eEnv } from './support/env';
import { signInLinkIn, waitForMessageTo } from './support/mailbox';
import { answerScreeningQuestion, type ScreeningQuestion } from './support/screening';
import { screenshotTaker } from './support/screenshots';

/** The recruiting demo study with an active consent version, seeded by the api's demo scenario. */
const studySlug = 'wayfinding-cues';

describe('participant takes part: study link to signed consent, instructions, signed PDF and withdrawal', () => {
  let browser: PhoneBrowser;
  const shoot = screenshotTaker('consent-journey');
  // Unique per run, so the mailbox match cannot pick up another run's message.
  const email = `journey.${Date.now()}.${Math.random().toString(36).slice(2, 8)}@example.test`;

  beforeAll(async () => {
    browser = await launchPhoneBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('joins from the study page, signs with a drawn mark, downloads the signed PDF and withdraws', async () => {
    const { page } = browser;

    // 1. The study link, signed out: what it involves, pay, eligibility.
    await page.goto(`${e2eEnv.portalUrl}/s/${studySlug}`);
    await page.getByRole('heading', { level: 1, name: 'Wayfinding cues' }).waitFor();
    await page.getByText('Total if you complete every step').waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'study-page');

    // 2. "Take part" asks for the e-mail address, carrying the study along.
    await page.getByRole('link', { name: 'Take part' }).click();
    await page.getByText('You came here from a study link. Sign in to continue.').waitFor();
    expect(new URL(page.url()).search).toBe(`?study=${studySlug}`);
    await page.getByLabel('Your e-mail address').fill(email);
    await page.getByRole('button', { name: 'Send me a sign-in link' }).click();
    await page.getByRole('heading', { name: 'Check your inbox' }).waitFor();
    await shoot(page, 'check-inbox');

    // 3. The link from the mailbox brings them back to the study page, signed in.
    const link = signInLinkIn(await waitForMessageTo(email));
    await page.goto(`${e2eEnv.portalUrl}${link.pathname}${link.search}`);
    await page.waitForURL(`**/s/${studySlug}`);
    await page.getByText(email).waitFor();
    await shoot(page, 'study-page-signed-in');

    // 4. Join, then the screening questions, answered so as to be eligible.
    await page.getByRole('button', { name: 'Take part' }).click();
    await page.getByRole('heading', { name: 'A few questions first' }).waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'screening');
    await page.getByRole('button', { name: 'Save my answers' }).click();
    await page
      .getByText(/Please (choose Yes or No|enter a number|choose one of the answers)\./)
      .first()
      .waitFor();
    await shoot(page, 'screening-unanswered');

    const studyId = await studyIdOf(page);
    const enrollment = await apiJson<{ screening: { questions: ScreeningQuestion[] } }>(
      page,
      `/api/studies/${studyId}/enrollments/me`,
    );
    for (const question of enrollment.screening.questions) await answerScreeningQuestion(page, question);
    await shoot(page, 'screening-answered');
    await page.getByRole('button', { name: 'Save my answers' }).click();

    // 5. Consent: key information on its own first, then the full form section by section.
    await page.getByText('Start here: the key points').waitFor();
    await page.getByText(/^Part 1 of \d+$/).waitFor();
    await page.getByText(/to read in all$/).waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'consent-key-information');

    await page.getByRole('button', { name: 'Read the full form' }).click();
    await page.getByText('The full consent form').waitFor();
    await shoot(page, 'consent-first-section');
    // A reload resumes at the same section.
    const sectionBefore = await page.locator('#reading-heading').textContent();
    await page.reload();
    await page.locator('#reading-heading').waitFor();
    expect(await page.locator('#reading-heading').textContent()).toBe(sectionBefore);

    for (let section = 0; section < 40; section += 1) {
      const next = page.getByRole('button', { name: /^(Next: .+|Continue to signing)$/ });
      const label = await next.textContent();
      await next.click();
      if (label === 'Continue to signing') break;
    }

    // 6. Signature: version and fingerprint shown, typed name, a mark drawn with the mouse, the meaning beside the button.
    await page.getByRole('heading', { name: 'Sign the consent form' }).waitFor();
    await page.getByText(/^Version \d+$/).waitFor();
    await page.getByText('“I have read this form and agree to take part”').waitFor();
    await page.getByRole('button', { name: 'Show the whole fingerprint' }).click();
    const whole = await page.getByLabel(/^Whole fingerprint: [0-9a-f]{64}$/).getAttribute('aria-label');
    expect(whole).toMatch(/^Whole fingerprint: [0-9a-f]{64}$/);
    await page.getByLabel('Your full name').fill('Robin Ash');
    const pad = page.getByRole('img', { name: 'Draw your signature (optional)' });
    await pad.scrollIntoViewIfNeeded();
    const box = await pad.boundingBox();
    if (!box) throw new Error('The signature pad has no size on screen');
    await page.mouse.move(box.x + box.width * 0.15, box.y + box.height * 0.6);
    await page.mouse.down();
    for (let step = 1; step <= 12; step += 1) {
      await page.mouse.move(
        box.x + box.width * (0.15 + step * 0.055),
        box.y + box.height * (0.6 - 0.25 * Math.sin(step / 2)),
      );
    }
    await page.mouse.up();
    await page.getByText('Drawing added.').waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'signature');

    // The browser does not expose a fetch Request's body to the test, so the page keeps a copy of what it sends.
    await page.evaluate(() => {
      const sent: string[] = [];
      (window as unknown as { sentSignatures: string[] }).sentSignatures = sent;
      const originalFetch = window.fetch.bind(window);
      window.fetch = async (input, init) => {
        if (input instanceof Request && input.url.endsWith('/enrollments/me/signature'))
          sent.push(await input.clone().text());
        return originalFetch(input, init);
      };
    });
    const signatureResponse = page.waitForResponse(
      (response) => response.url().endsWith('/enrollments/me/signature') && response.request().method() === 'POST',
    );
    await page.getByRole('button', { name: 'Sign the form' }).click();
    const signature = await signatureResponse;
    expect(signature.status(), `signature answered: ${await signature.text()}`).toBe(201);
    const [sentBody] = await page.evaluate(() => (window as unknown as { sentSignatures: string[] }).sentSignatures);
    const signedBody = JSON.parse(sentBody ?? 'null') as { mark?: string; typedName: string; fingerprint: string };
    expect(signedBody.typedName).toBe('Robin Ash');
    expect(signedBody.mark).toMatch(/^data:image\/png;base64,/);
    expect(`Whole fingerprint: ${signedBody.fingerprint}`).toBe(whole);

    // 7. The condition's participant-facing label and instructions, and the steps.
    await page.getByText('You have signed the consent form').waitFor();
    await page.getByText('What you will do').waitFor();
    const conditionLabel = await page.locator('#your-condition-heading').textContent();
    expect(conditionLabel).toMatch(/^Route guide, version [123]$/);
    for (const internalName of ['audio cues', 'map cues', 'no cues']) {
      expect(await page.getByText(internalName, { exact: false }).count()).toBe(0);
    }
    await page.getByRole('heading', { name: 'Your steps' }).waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'condition-instructions');

    // 8. The signed PDF: offered once the background job has made it, and really a PDF.
    const downloadLink = page.getByRole('link', { name: 'Download your signed form (PDF)' });
    await downloadLink.waitFor({ timeout: 30_000 });
    await shoot(page, 'signed-form-ready');
    const [download] = await Promise.all([page.waitForEvent('download'), downloadLink.click()]);
    const path = await download.path();
    const bytes = await readFile(path);
    expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(download.suggestedFilename()).toMatch(/^signed-consent-.+\.pdf$/);
    const direct = await page.request.get(`${e2eEnv.portalUrl}/api/studies/${studyId}/enrollments/me/consent.pdf`);
    expect(direct.headers()['content-type']).toContain('application/pdf');
    expect((await direct.body()).subarray(0, 5).toString('latin1')).toBe('%PDF-');

    // 9. Withdraw: the dialog shows the amounts, takes an optional reason, then a confirmation.
    await page.getByRole('button', { name: 'Stop taking part' }).click();
    await page.getByText('Stop taking part?', { exact: true }).waitFor();
    await page.getByText('What you have earned', { exact: true }).waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'withdraw-dialog', { fullPage: false });
    await page.getByLabel('Would you like to tell us why? (optional)').fill('My weeks have become too busy.');
    await shoot(page, 'withdraw-dialog-reason', { fullPage: false });
    await page.getByRole('button', { name: 'Yes, stop taking part' }).click();
    await page.getByRole('heading', { name: 'You have stopped taking part' }).waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'withdrawn');

    // Still true after a reload: the server holds the state.
    await page.reload();
    await page.getByRole('heading', { name: 'You have stopped taking part' }).waitFor();

    // 10. "Your studies" lists the study, linking to its page.
    await page.goto(`${e2eEnv.portalUrl}/studies`);
    const studyLink = page.getByRole('link', { name: 'Wayfinding cues' });
    await studyLink.waitFor();
    expect(await studyLink.getAttribute('href')).toBe(`/s/${studySlug}`);
    await shoot(page, 'your-studies');
  });
});

async function studyIdOf(page: PhoneBrowser['page']): Promise<string> {
  const study = await apiJson<{ id: string }>(page, `/api/public/studies/${studySlug}`);
  return study.id;
}

/** Through the page's own session cookies, as the portal would ask. */
async function apiJson<T>(page: PhoneBrowser['page'], path: string): Promise<T> {
  const response = await page.request.get(`${e2eEnv.portalUrl}${path}`);
  if (!response.ok()) throw new Error(`GET ${path} answered ${response.status()}: ${await response.text()}`);
  return (await response.json()) as T;
}
