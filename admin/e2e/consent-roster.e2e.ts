import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import type { Locator, Page } from 'playwright-core';
import { adminUrl, openBrowser, screenshot, signIn, type BrowserSession } from './support/browser';

const journey = 'consent-roster';
const sha256Hex = /(?<![0-9a-f])[0-9a-f]{64}(?![0-9a-f])/;

/** Waits for the landing page after sign-in, or fails with what the sign-in form said (e.g. the api's rate limit). */
async function landOn(page: Page, landing: Locator): Promise<void> {
  const refusal = page.getByRole('alert');
  try {
    await landing.or(refusal).first().waitFor();
  } catch (error) {
    await screenshot(page, journey, 'sign-in-stuck');
    throw error;
  }
  if (!(await landing.isVisible())) throw new Error(`Sign-in was refused: ${await refusal.first().textContent()}`);
}

describe('consent versions, roster and audit trail', () => {
  let browser: BrowserSession;

  beforeAll(async () => {
    browser = await openBrowser();
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('a coordinator drafts a consent version, checks it, works the roster and opens a signed record; an auditor checks the trail', async () => {
    const { page } = browser;
    const stamp = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`;

    // Sign in once: the dev api allows 10 sign-ins per address per 15 minutes.
    await page.goto(`${adminUrl}/sign-in`);
    await signIn(page, 'coordinator@evenhand.test');
    await landOn(page, page.getByRole('heading', { name: 'Studies', level: 1 }));
    await page.getByRole('link', { name: 'Wayfinding cues' }).click();
    await page.getByRole('heading', { name: 'Wayfinding cues', level: 1 }).waitFor();
    const studyPath = new URL(page.url()).pathname.match(/^\/studies\/[0-9a-f-]{36}/)?.[0];
    expect(studyPath).toBeTruthy();

    // Consent: the active version with its full fingerprint.
    await page.getByRole('link', { name: 'Consent', exact: true }).click();
    await page.waitForURL((url) => url.pathname === `${studyPath}/consent`);
    const active = page.getByRole('region', { name: /Participants now sign version \d+/ });
    await active.waitFor();
    expect(await active.textContent()).toMatch(sha256Hex);
    await page.getByRole('table', { name: 'Consent versions, newest first' }).waitFor();
    expect(await page.getByText('Templates are a starting point, not legal advice.').first().isVisible()).toBe(true);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'consent-active-version');

    // A new draft from the template, with some fields filled in.
    await page.getByRole('button', { name: 'New draft from template' }).click();
    await page.getByText('New draft from a template').waitFor();
    const draftDialog = page.getByRole('dialog');
    await draftDialog.getByText('Templates are a starting point, not legal advice.').waitFor();
    await draftDialog.getByLabel('Institution', { exact: true }).fill('Harbor Lane Institute');
    await draftDialog.getByLabel('Investigator in charge').fill('Dr. Ilse Marrow');
    await draftDialog.getByLabel('Name of the ethics board').fill('Harbor Lane Research Ethics Board');
    await draftDialog.getByLabel('Days until payment is sent').fill('ten');
    await draftDialog.getByRole('button', { name: 'Create draft' }).click();
    await draftDialog.getByText('Enter the days until payment as a whole number, or leave it blank.').waitFor();
    await draftDialog.getByLabel('Days until payment is sent').fill('10');
    await screenshot(page, journey, 'new-draft-dialog');
    await draftDialog.getByRole('button', { name: 'Create draft' }).click();
    await page.getByText(/Draft version \d+ was created from the template/).waitFor();
    await page.getByRole('heading', { name: /Consent version \d+/ }).waitFor();
    const textarea = page.getByLabel('Form text (Markdown)');
    expect(await textarea.inputValue()).toContain('Harbor Lane Institute');

    // The required-elements check: each finding with its citation or placeholder, a click jumps to its line.
    await page.getByRole('button', { name: 'Run the check' }).click();
    const findings = page.getByRole('list', { name: 'Findings' });
    await findings.waitFor();
    expect(await findings.getByRole('listitem').count()).toBeGreaterThan(0);
    const jump = findings.getByRole('button', { name: /Go to line \d+ in the text/ }).first();
    const line = Number((await jump.textContent())?.match(/Go to line (\d+)/)?.[1]);
    await jump.click();
    const selected = await textarea.evaluate((element: HTMLTextAreaElement) => ({
      focused: document.activeElement === element,
      startLine: element.value.slice(0, element.selectionStart).split('\n').length,
      text: element.value.slice(element.selectionStart, element.selectionEnd),
    }));
    expect(selected.focused).toBe(true);
    expect(selected.startLine).toBe(line);
    expect(selected.text.length).toBeGreaterThan(0);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'draft-check-findings');

    // Filled in again from the study: the form starts from the values the draft was made with; the new text replaces
    // the old, hand edits included.
    await textarea.fill(`${await textarea.inputValue()}\n\nA sentence typed by hand.`);
    await page.getByRole('button', { name: 'Fill in again from the study…' }).click();
    const refillDialog = page.getByRole('dialog');
    await refillDialog.getByText(/including the edits in the text box that are not saved yet/).waitFor();
    expect(await refillDialog.getByLabel('Investigator in charge').inputValue()).toBe('Dr. Ilse Marrow');
    expect(await refillDialog.getByLabel('Days until payment is sent').inputValue()).toBe('10');
    await refillDialog.getByLabel('Investigator in charge').fill('Dr. Ilse Marrow-Tennant');
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'refill-draft-dialog');
    await refillDialog.getByRole('button', { name: 'Replace the text' }).click();
    await page.getByText('Filled in again from the study and the template. The preview shows the new text.').waitFor();
    const refilledText = await textarea.inputValue();
    expect(refilledText).toContain('Dr. Ilse Marrow-Tennant');
    expect(refilledText).not.toContain('A sentence typed by hand.');

    // Approval details and letter on the draft; the activation dialog is read, then cancelled (activating would ask every
    // enrolled demo participant to sign again).
    await page.getByLabel('Approval reference').fill(`HLREB-J-${stamp}`);
    await page.getByLabel('Approval date').fill('2026-11-28');
    await page.getByRole('button', { name: 'Save approval details' }).click();
    await page.getByText('Approval details saved.').waitFor();
    const pngRenamed = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]);
    await page
      .getByLabel('Approval letter (PDF, up to 10 MB)')
      .setInputFiles({ name: 'approval.pdf', mimeType: 'application/pdf', buffer: pngRenamed });
    await page.getByText(/This file is not a PDF/).waitFor();
    const letterName = `approval-${stamp}.pdf`;
    // A minimal one-page PDF: the api loads the letter as a PDF.
    const pdf = Buffer.from(
      '%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[3 0 R]/Count 1>>endobj\n' +
        '3 0 obj<</Type/Page/Parent 2 0 R/MediaBox[0 0 612 792]>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n',
      'latin1',
    );
    await page
      .getByLabel('Approval letter (PDF, up to 10 MB)')
      .setInputFiles({ name: letterName, mimeType: 'application/pdf', buffer: pdf });
    await page.getByText(`${letterName} was uploaded.`).waitFor();
    expect(await page.getByText(letterName, { exact: false }).first().isVisible()).toBe(true);
    await page.getByRole('button', { name: /^Activate version \d+…$/ }).click();
    await page.getByText(/^Activate version \d+\?$/).waitFor();
    await page.getByText('Everyone enrolled is asked to sign again.').waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'activation-dialog');
    await page.getByRole('alertdialog').getByRole('button', { name: 'Cancel' }).click();
    await page.getByText(/^Activate version \d+\?$/).waitFor({ state: 'detached' });

    // Roster: only the people who still have to sign the newest version.
    await page.getByRole('link', { name: 'Roster', exact: true }).click();
    await page.waitForURL((url) => url.pathname === `${studyPath}/roster`);
    const roster = page.getByRole('table', { name: /^Roster/ });
    await roster.waitFor();
    await page.getByRole('button', { name: /^Needs re-consent/ }).click();
    await page.waitForURL((url) => url.searchParams.get('reconsent') === '1');
    await expect.poll(async () => (await roster.getByRole('row').count()) > 1).toBe(true);
    await expect
      .poll(async () => {
        const rows = await roster.getByRole('row').all();
        const texts = await Promise.all(rows.slice(1).map((row) => row.textContent()));
        return texts.every((text) => text?.includes('Re-consent needed'));
      })
      .toBe(true);
    expect(await page.getByRole('button', { name: /^Needs re-consent/ }).getAttribute('aria-pressed')).toBe('true');
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'roster-needs-reconsent');

    // CSV import with one bad row: the row report names its line and column.
    await page.getByRole('button', { name: 'Import CSV…' }).click();
    await page.getByText('Import invitees from a CSV file').waitFor();
    const csv = [
      'email,name,sense_of_direction',
      `journey-${stamp}-a@evenhand.test,Journey Invitee A,41`,
      'not-an-address,Journey Invitee B,63',
      `journey-${stamp}-c@evenhand.test,Journey Invitee C,77`,
    ].join('\n');
    await page
      .getByLabel('CSV file (up to 5 MB)')
      .setInputFiles({ name: `invitees-${stamp}.csv`, mimeType: 'text/csv', buffer: Buffer.from(csv) });
    await page.getByRole('button', { name: 'Import', exact: true }).click();
    const report = page.getByRole('table', { name: 'Problems found, row by row' });
    await report.waitFor();
    const reportRows = await report.getByRole('row').all();
    expect(reportRows).toHaveLength(2);
    expect(await reportRows[1]!.textContent()).toContain('3email"not-an-address" is not an e-mail address');
    const summary = page.getByRole('list', { name: 'Import summary' });
    expect(await summary.textContent()).toContain('2people added');
    expect(await summary.textContent()).toContain('1row refused');
    await screenshot(page, journey, 'import-row-report');
    await page.getByRole('button', { name: 'Done', exact: true }).click();
    await page.getByText('Import invitees from a CSV file').waitFor({ state: 'detached' });

    // A participant's record with a signature: fingerprints, meaning and the audit timeline.
    await roster
      .getByRole('link', { name: /^Open the record of / })
      .first()
      .click();
    await page.waitForURL((url) => url.pathname.startsWith(`${studyPath}/roster/`));
    const signature = page.getByRole('article', { name: /Signature on version \d+/ }).first();
    await signature.waitFor();
    expect(await signature.textContent()).toContain('I have read this form and agree to take part');
    expect(await signature.textContent()).toMatch(sha256Hex);
    await page
      .getByRole('button', { name: /Download the signed PDF of version \d+/ })
      .first()
      .waitFor();
    const timeline = page.getByRole('region', { name: 'Timeline' });
    expect(await timeline.textContent()).toMatch(/Participant P-[A-Z0-9]+ signed consent version \d+\./);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'participant-record');

    // The auditor reads the trail and runs the integrity check.
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
    await signIn(page, 'auditor@evenhand.test');
    // Sign-in returns to the page that was open (the participant record, not the auditor's); the main nav leads on.
    const nav = page.getByRole('navigation', { name: 'Main' });
    await landOn(page, nav.getByRole('link', { name: 'Audit trail' }));
    await nav.getByRole('link', { name: 'Audit trail' }).click();
    await page.getByRole('heading', { name: 'Audit trail', level: 1 }).waitFor();
    await page.getByRole('heading', { name: 'What happened' }).waitFor();
    await page
      .getByRole('button', { name: /^Details of “/ })
      .first()
      .click();
    await page.getByText('Previous hash').first().waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'audit-event-expanded');
    await page.getByRole('checkbox', { name: 'Consent' }).click();
    await page.waitForURL((url) => url.searchParams.getAll('family').includes('consent'));
    await page
      .getByText(/^Coordinator C\. Vasquez-Hale started consent version \d+ from a template\.$/)
      .first()
      .waitFor();
    await page.getByRole('button', { name: 'Check the trail' }).click();
    const chains = page.getByRole('list', { name: 'Chains checked' });
    await chains.waitFor({ timeout: 60_000 });
    expect(await page.getByText('Intact.').isVisible()).toBe(true);
    expect(await chains.textContent()).toContain('Wayfinding cues');
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'audit-integrity');
  });
});
