import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import { adminUrl, openBrowser, screenshotAtBothWidths, signIn, type BrowserSession } from './support/browser';

const journey = 'study-details';

describe('a coordinator edits a running study’s details and archives a closed one', () => {
  let browser: BrowserSession;

  beforeAll(async () => {
    browser = await openBrowser();
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('edits what may still change, is told early what may not, and moves a closed pilot in and out of the archive', async () => {
    const { page } = browser;
    await page.goto(`${adminUrl}/sign-in`);
    await signIn(page, 'coordinator@evenhand.test');
    await page.getByRole('heading', { name: 'Studies', level: 1 }).waitFor();
    const current = page.getByRole('table', { name: 'Your studies' });
    await current.getByRole('link', { name: 'Wayfinding cues' }).waitFor();
    // The closed, archived pilot is not in the default list.
    expect(await current.getByRole('link', { name: 'Signage pilot' }).count()).toBe(0);

    // Edit details on a study where people are already assigned.
    await current.getByRole('link', { name: 'Wayfinding cues' }).click();
    await page.getByRole('heading', { name: 'Wayfinding cues', level: 1 }).waitFor();
    await page.getByRole('button', { name: 'Edit details' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByText('Edit study details').waitFor();
    await dialog.getByRole('list', { name: 'What may change, and when' }).waitFor();
    expect(await dialog.getByLabel('Protocol reference').getAttribute('readonly')).not.toBeNull();
    await dialog.getByLabel('Budget (USD)').fill('1');
    await dialog.getByLabel('Target number of participants').fill('1');
    await dialog.getByRole('button', { name: 'Save details' }).click();
    await dialog.getByText('People are already assigned, so the budget may be raised but not lowered.').waitFor();
    await dialog.getByText(/already assigned, so the target cannot be lower\./).waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshotAtBothWidths(page, journey, 'edit-refused-early');

    await page.getByRole('button', { name: 'Cancel' }).click();
    await page.getByRole('button', { name: 'Edit details' }).click();
    await dialog.getByLabel('Ethics approval reference').fill('HLREB-2026-031-A1');
    await dialog.getByLabel('Contact e-mail').fill('wayfinding-desk@harborlane.test');
    await dialog.getByLabel('Title').fill('Wayfinding cues');
    await screenshotAtBothWidths(page, journey, 'edit-allowed');
    await dialog.getByRole('button', { name: 'Save details' }).click();
    await expect.poll(() => page.getByRole('dialog').count()).toBe(0);
    const header = page.locator('main header').first();
    await header.getByText('HLREB-2026-031-A1').waitFor();
    await header.getByText('HLCL-2026-014').waitFor();
    await screenshotAtBothWidths(page, journey, 'details-saved');

    // The archive: the pilot is there, and opens with all its records.
    await page.goto(`${adminUrl}/studies`);
    await page.getByRole('navigation', { name: 'Which studies' }).getByRole('link', { name: 'Archive' }).click();
    const archive = page.getByRole('table', { name: 'Archived studies' });
    await archive.getByRole('link', { name: 'Signage pilot' }).waitFor();
    expect(await archive.getByRole('link', { name: 'Wayfinding cues' }).count()).toBe(0);
    await screenshotAtBothWidths(page, journey, 'archive-list');
    await archive.getByRole('link', { name: 'Signage pilot' }).click();
    await page.getByRole('heading', { name: 'Signage pilot', level: 1 }).waitFor();
    await page.getByText('Archived', { exact: true }).waitFor();
    expect(await page.getByRole('button', { name: 'Edit details' }).count()).toBe(0);
    await screenshotAtBothWidths(page, journey, 'archived-study');

    await page.getByRole('button', { name: 'Take out of the archive' }).click();
    await page.getByText('Take Signage pilot out of the archive?').waitFor();
    await page.getByRole('alertdialog').getByRole('button', { name: 'Take out of the archive' }).click();
    await page.getByRole('button', { name: 'Archive', exact: true }).waitFor();
    expect(await page.getByText('Archived', { exact: true }).count()).toBe(0);
    await page.goto(`${adminUrl}/studies`);
    await page.getByRole('table', { name: 'Your studies' }).getByRole('link', { name: 'Signage pilot' }).click();

    await page.getByRole('button', { name: 'Archive', exact: true }).click();
    await page.getByText('Archive Signage pilot?').waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshotAtBothWidths(page, journey, 'confirm-archive');
    await page.getByRole('alertdialog').getByRole('button', { name: 'Archive study' }).click();
    await page.getByText('Archived', { exact: true }).waitFor();
    await page.goto(`${adminUrl}/studies`);
    await page.getByRole('table', { name: 'Your studies' }).getByRole('link', { name: 'Wayfinding cues' }).waitFor();
    expect(
      await page.getByRole('table', { name: 'Your studies' }).getByRole('link', { name: 'Signage pilot' }).count(),
    ).toBe(0);
  });
});
