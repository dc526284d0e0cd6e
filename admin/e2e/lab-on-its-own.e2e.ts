import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import {
  adminUrl,
  desktopViewport,
  openBrowser,
  phoneViewport,
  screenshot,
  screenshotAtBothWidths,
  signIn,
  type BrowserSession,
} from './support/browser';

const journey = 'lab-on-its-own';

/** A date two days ahead in the browser's own time zone, as a date input takes it. */
function dayAfterTomorrow(): string {
  const later = new Date(Date.now() + 2 * 86_400_000);
  const pad = (value: number) => String(value).padStart(2, '0');
  return `${later.getFullYear()}-${pad(later.getMonth() + 1)}-${pad(later.getDate())}`;
}

describe('a lab sets up and checks a study without help', () => {
  let browser: BrowserSession;

  beforeAll(async () => {
    browser = await openBrowser();
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('dry-runs with one click from the screened people’s mix, hears early that a draft needs a paid step, and cannot enter a future approval date', async () => {
    const { page } = browser;
    await page.goto(`${adminUrl}/sign-in`);
    await signIn(page, 'researcher@evenhand.test');
    await page.getByRole('heading', { name: 'Studies', level: 1 }).waitFor();

    // The demo study has screened people: the dry run starts from their mix and runs without typing.
    await page.getByRole('link', { name: 'Wayfinding cues' }).first().click();
    await page.getByRole('heading', { name: 'Wayfinding cues', level: 1 }).waitFor();
    await page.getByRole('link', { name: 'Assignment', exact: true }).click();
    const mixSentence = page.getByText(/^Using the mix of the \d+ people screened so far\./);
    await mixSentence.waitFor();
    expect(await page.getByLabel('Average').first().inputValue()).not.toBe('');
    await page.getByRole('button', { name: 'Run dry run' }).click();
    await page.getByRole('heading', { name: /^Result: 1,000 simulated arrivals/ }).waitFor({ timeout: 60_000 });
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshotAtBothWidths(page, journey, 'dry-run-from-screened-mix');

    // A fresh study with no steps yet: the consent draft says so at the first try, in plain words.
    const stamp = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 5)}`;
    const created = await page.request.post(`${adminUrl}/api/studies`, {
      data: { slug: `corridor-quiet-${stamp}`, title: `Quiet corridors ${stamp}`, design: 'between' },
    });
    expect(created.status()).toBe(201);
    const studyId = ((await created.json()) as { id: string }).id;
    await page.goto(`${adminUrl}/studies/${studyId}/consent`);
    await page.getByRole('button', { name: 'New draft from template' }).first().click();
    const draftDialog = page.getByRole('dialog');
    await draftDialog.getByText(/Steps and pay come from the study’s set-up: it has no steps yet/).waitFor();
    await draftDialog.getByRole('button', { name: 'Create draft' }).click();
    await draftDialog
      .getByText(
        'Add at least one step with its pay on the Set-up tab first: the form tells people what each step pays.',
      )
      .waitFor();
    expect(await draftDialog.getByText(/steps:/).count()).toBe(0);
    await screenshot(page, journey, 'draft-needs-a-paid-step');
    await page.setViewportSize(phoneViewport);
    await draftDialog.getByText(/^Add at least one step with its pay/).scrollIntoViewIfNeeded();
    await screenshot(page, journey, 'draft-needs-a-paid-step-phone');
    await page.setViewportSize(desktopViewport);
    await draftDialog.getByRole('button', { name: 'Cancel' }).click();

    // With a paid step the draft is made; a future approval date is refused as soon as the field is left.
    const step = await page.request.post(`${adminUrl}/api/studies/${studyId}/steps`, {
      data: { title: 'Session 1: the quiet corridor', payMinor: 1200 },
    });
    expect(step.status()).toBe(201);
    await page.reload();
    await page.getByRole('button', { name: 'New draft from template' }).first().click();
    await page
      .getByRole('dialog')
      .getByText(/set-up: 1 step\./)
      .waitFor();
    await page.getByRole('dialog').getByRole('button', { name: 'Create draft' }).click();
    await page.getByText(/Draft version \d+ was created from the template/).waitFor();
    const approvalDate = page.getByLabel('Approval date');
    await approvalDate.fill(dayAfterTomorrow());
    // Tab moves between the day, month and year inside a date input; leaving it is a click elsewhere.
    await page.getByLabel('Approval reference').click();
    await page.getByText('The approval date cannot be in the future: enter the date printed on the letter.').waitFor();
    expect(await approvalDate.getAttribute('aria-invalid')).toBe('true');
    await screenshotAtBothWidths(page, journey, 'future-approval-date');
  });
});
