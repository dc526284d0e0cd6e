import { readFileSync } from 'node:fs';
import type { Download, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import {
  adminUrl,
  openBrowser,
  screenshot,
  screenshotAtBothWidths,
  signIn,
  type BrowserSession,
} from './support/browser';

const journey = 'audit-trail';

async function downloaded(page: Page, click: () => Promise<void>): Promise<{ name: string; text: string }> {
  const [download]: [Download, void] = await Promise.all([page.waitForEvent('download'), click()]);
  const path = await download.path();
  return { name: download.suggestedFilename(), text: readFileSync(path, 'utf8') };
}

describe('the auditor reads the audit trail', () => {
  let browser: BrowserSession;

  beforeAll(async () => {
    browser = await openBrowser();
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('filters the trail by one participant, reads the sentences, exports them and downloads a receipt', async () => {
    const { page } = browser;
    await page.goto(`${adminUrl}/sign-in`);
    await signIn(page, 'auditor@evenhand.test');
    await page.getByRole('link', { name: 'Audit trail' }).first().click();
    await page.getByRole('heading', { name: 'Audit trail', level: 1 }).waitFor();
    await page.getByRole('heading', { name: 'What happened' }).waitFor();
    await page.getByRole('checkbox', { name: 'Payouts' }).waitFor();

    // The demo's history reads as sentences throughout: nothing falls outside the named kinds of action.
    await page.getByRole('checkbox', { name: 'Other' }).click();
    await page.getByText('Nothing matches').waitFor();
    await page.getByRole('checkbox', { name: 'Other' }).click();

    // A participant who did a step: the first step sentence names them.
    await page.getByRole('checkbox', { name: 'Steps' }).click();
    await page.waitForURL((url) => url.searchParams.getAll('family').includes('steps'));
    const stepSentence = page.getByText(/^Participant P-[A-Z0-9]+ finished the step/).first();
    await stepSentence.waitFor();
    const reference = /Participant (P-[A-Z0-9]+)/.exec((await stepSentence.textContent()) ?? '')![1]!;
    await screenshot(page, journey, 'steps-only');

    await page.getByRole('button', { name: 'Clear filters' }).click();
    await page.waitForURL((url) => url.search === '');
    await page.getByLabel('Participant reference').fill(reference);
    await page.getByRole('button', { name: 'Show', exact: true }).click();
    await page.waitForURL((url) => url.searchParams.get('participant') === reference);
    await page.getByText(`Participant ${reference} joined the study.`).waitFor();

    // Every sentence is about this person: theirs, or an approval that covered their payout.
    const entries = page.getByRole('region', { name: /\d{4}$/ }).getByRole('listitem');
    await expect.poll(() => entries.count()).toBeGreaterThan(3);
    const sentences = await page.locator('ol > li p.text-sm').allTextContents();
    expect(sentences.some((s) => s.includes(`Participant ${reference} signed consent version`))).toBe(true);
    expect(sentences.some((s) => /finished the step|marked the step/.test(s))).toBe(true);
    for (const sentence of sentences) {
      for (const other of sentence.match(/P-[A-Z0-9]{6}/g) ?? []) expect(other).toBe(reference);
      expect(sentence).not.toMatch(/\b(payout|consent|step|enrollment)\.[a-z-]+\b/);
    }
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshotAtBothWidths(page, journey, 'one-participant');

    // The stored fields are one click away.
    const firstDetails = page.getByRole('button', { name: /^Details of “/ }).first();
    await firstDetails.click();
    await page.getByText('Previous hash').first().waitFor();
    await screenshot(page, journey, 'details-open');

    const csv = await downloaded(page, () => page.getByRole('link', { name: 'Export as CSV' }).click());
    expect(csv.name).toMatch(/^audit-trail-(wayfinding-cues|checkout-flows)-\d{4}-\d{2}-\d{2}\.csv$/);
    expect(csv.text.charCodeAt(0)).toBe(0xfeff);
    expect(csv.text).toContain('when_utc,study,kind,action,what_happened,by,participant,amount,currency');
    expect(csv.text).toContain(`Participant ${reference} joined the study.`);
    const summary = await downloaded(page, () => page.getByRole('link', { name: 'Verification summary' }).click());
    expect(summary.name).toBe(csv.name.replace('.csv', '-verification.txt'));
    expect(summary.text).toContain(`Participant: ${reference}`);
    expect(summary.text).toContain(`File: ${csv.name}`);
    expect(summary.text).toMatch(/SHA-256 of the file: [0-9a-f]{64}/);

    // Seal a receipt, download it, then check the trail against it.
    await page.getByRole('button', { name: 'Seal a receipt now' }).click();
    const sealed = await page.getByText(/^Receipt no\. \d+ sealed/).textContent();
    const number = /no\. (\d+)/.exec(sealed ?? '')![1];
    const receipt = await downloaded(page, () =>
      page.getByRole('link', { name: `Download receipt no. ${number}` }).click(),
    );
    expect(receipt.name).toBe(`audit-receipt-${number}.json`);
    expect(JSON.parse(receipt.text)).toMatchObject({
      format: 'evenhand-audit-receipt/1',
      number: Number(number),
      mac: expect.stringMatching(/^[0-9a-f]{64}$/),
    });

    await page.getByRole('button', { name: 'Check the trail' }).click();
    await page.getByText('Intact.').waitFor({ timeout: 60_000 });
    expect(
      await page.getByText(`Checked against audit receipt no. ${number}`, { exact: false }).count(),
    ).toBeGreaterThan(0);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshotAtBothWidths(page, journey, 'verified');
  });
});
