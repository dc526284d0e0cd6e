import type { Page } from 'playwright-core';
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

const journey = 'steps-contacts';

interface RosterEntry {
  id: string;
  reference: string;
  status: string;
  needsReconsent: boolean;
  nextStep: { stepId: string; title: string; timing: string } | null;
}

async function signInAs(page: Page, email: string): Promise<void> {
  await page.context().clearCookies();
  await page.goto(`${adminUrl}/sign-in`);
  await signIn(page, email);
  const landing = page.getByRole('heading', { name: 'Studies', level: 1 });
  await landing.or(page.getByRole('alert')).first().waitFor();
  if (!(await landing.isVisible()))
    throw new Error(`Sign-in was refused: ${await page.getByRole('alert').first().textContent()}`);
}

/** Opens a demo study from the studies list and returns its id. */
async function openDemoStudy(page: Page, title: string): Promise<string> {
  await page.goto(`${adminUrl}/studies`);
  await page.getByRole('table', { name: 'Your studies' }).getByRole('link', { name: title }).click();
  await page.getByRole('heading', { name: title, level: 1 }).waitFor();
  const id = new URL(page.url()).pathname.match(/^\/studies\/([0-9a-f-]{36})/)?.[1];
  if (!id) throw new Error(`No study id in ${page.url()}`);
  return id;
}

/**
 * People taking part whose next step can be marked done now (open or overdue, consent current), read through the api
 * with the browser's own session, so the journey does not depend on the demo's exact numbers.
 */
async function markableParticipants(page: Page, studyId: string): Promise<RosterEntry[]> {
  const found: RosterEntry[] = [];
  for (const status of ['active', 'assigned']) {
    const response = await page.request.get(
      `${adminUrl}/api/studies/${studyId}/enrollments?status=${status}&pageSize=200`,
    );
    expect(response.status()).toBe(200);
    const { items } = (await response.json()) as { items: RosterEntry[] };
    found.push(
      ...items.filter(
        (entry) => !entry.needsReconsent && entry.nextStep && ['open', 'overdue'].includes(entry.nextStep.timing),
      ),
    );
  }
  return found;
}

describe('steps, completions, reminders and contacts', () => {
  let browser: BrowserSession;

  beforeAll(async () => {
    browser = await openBrowser();
    await browser.context.grantPermissions(['clipboard-read', 'clipboard-write'], { origin: adminUrl });
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('a coordinator sets up a step checked by a return link, copies the return-address template and plans reminders', async () => {
    const { page } = browser;
    const stamp = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 5)}`;
    const title = `Stairwell cues ${stamp}`;
    await signInAs(page, 'coordinator@evenhand.test');

    await page.getByRole('link', { name: 'New study' }).first().click();
    await page.getByRole('heading', { name: 'New study', level: 1 }).waitFor();
    await page.getByLabel('Title').fill(title);
    await page.getByLabel('Protocol reference').fill('HLCL-2027-044');
    await page
      .getByLabel('Summary for participants')
      .fill('One online session finding the way out of a virtual stairwell.');
    await page.getByRole('radio', { name: /Between subjects/ }).click();
    await page.getByRole('button', { name: 'Create study' }).click();
    await page.getByRole('heading', { name: title, level: 1 }).waitFor();

    // The checklist sits under the Open button and says what is missing.
    const checklist = page.getByRole('list', { name: 'Opening checklist' });
    await checklist.waitFor();
    await expect.poll(() => checklist.getByRole('listitem').count()).toBeGreaterThanOrEqual(3);
    expect(await checklist.textContent()).toMatch(/still needed/);
    await screenshotAtBothWidths(page, journey, 'new-study-checklist');

    // A step, then how it is checked: a return link from the lab's external task.
    await page.locator('#steps').getByRole('button', { name: 'Add step' }).click();
    const addDialog = page.getByRole('dialog');
    await addDialog.getByLabel('Step title').fill('Session 1: the stairwell');
    await addDialog.getByLabel('Pay (USD)').fill('9');
    await addDialog.getByRole('button', { name: 'Add step' }).click();
    await page.getByText('The step was added.').waitFor();
    await expect.poll(async () => (await checklist.textContent()) ?? '').not.toMatch(/at least one step/i);

    await page.getByRole('button', { name: 'Choose how step 1 is checked and when it opens' }).click();
    const settings = page.getByRole('dialog');
    await settings.getByText('How step 1 is checked').waitFor();
    await settings.getByRole('radio', { name: /Return link from an external task/ }).click();
    await settings.getByRole('button', { name: 'Save how it is checked' }).click();
    await settings.getByText('Enter the address of the external task.').waitFor();
    await settings.getByLabel('Address of the external task').fill('https://tasks.harborlane.test/stairwell/session-1');
    await settings.getByLabel('Opens after (days)').fill('0');
    await settings.getByRole('button', { name: /^Counted from/ }).click();
    await page.getByRole('option', { name: 'after assignment' }).click();
    await settings.getByRole('radio', { name: /Due within a number of days/ }).click();
    await settings.getByLabel('Due within (days)').fill('5');
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshotAtBothWidths(page, journey, 'step-return-link-dialog');
    await settings.getByRole('button', { name: 'Save how it is checked' }).click();
    await page.getByText('How step 1 is checked was saved.').waitFor();
    const stepFacts = page.getByLabel('How step 1 is checked and when', { exact: true });
    await expect.poll(async () => (await stepFacts.textContent()) ?? '').toContain('Return link from an external task');
    expect(await stepFacts.textContent()).toContain('https://tasks.harborlane.test/stairwell/session-1');
    expect(await stepFacts.textContent()).toContain('Opens at assignment · due within 5 days');

    // The return address template, copied to the clipboard.
    const returnPanel = page.getByRole('region', { name: 'Return address for your external task' });
    await returnPanel.scrollIntoViewIfNeeded();
    const template = await returnPanel.getByLabel('Return address template', { exact: true }).inputValue();
    expect(template).toMatch(/^https?:\/\/.+\/api\/return\/\{token\}$/);
    for (const parameter of ['ref', 'token', 'return', 'code']) {
      await returnPanel
        .getByLabel('Parameters added to the task address')
        .getByText(parameter, { exact: true })
        .waitFor();
    }
    await returnPanel.getByRole('button', { name: 'Copy the return address template' }).click();
    await returnPanel.getByText('Copied', { exact: true }).waitFor();
    expect(await page.evaluate(() => navigator.clipboard.readText())).toBe(template);
    await screenshotAtBothWidths(page, journey, 'return-address-copied');

    // Rotating the key is confirmed with the grace period spelled out; cancelled here.
    await returnPanel.getByRole('button', { name: 'Rotate the signing key…' }).click();
    await page
      .getByRole('alertdialog')
      .getByText(/keep working for \d+ days/)
      .waitFor();
    await screenshot(page, journey, 'rotate-key-confirm');
    await page.getByRole('alertdialog').getByRole('button', { name: 'Cancel' }).click();
    await page.getByRole('alertdialog').waitFor({ state: 'detached' });

    // One reminder plan for every condition.
    const reminders = page.getByRole('form', { name: 'Reminder plan' });
    await reminders.scrollIntoViewIfNeeded();
    await page.getByText('One plan for every condition, by design.').waitFor();
    const before = await reminders.getByRole('list', { name: 'Planned reminders' }).getByRole('listitem').count();
    await reminders.getByRole('button', { name: 'Add a reminder' }).click();
    await reminders.getByLabel(`Reminder ${before + 1}: days`).fill('2');
    await reminders.getByLabel('Suggest “lost to follow-up” after this many unanswered reminders').fill('3');
    await reminders.getByRole('button', { name: 'Save the reminder plan' }).click();
    await reminders.getByText('The reminder plan was saved.', { exact: false }).waitFor();
    expect(await page.getByTestId('reminder-preview').textContent()).toMatch(/Subject:/);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshotAtBothWidths(page, journey, 'reminder-plan');
  });

  it('a coordinator marks a step done for a pasted list with one bad line and reads the row report', async () => {
    const { page } = browser;
    await signInAs(page, 'coordinator@evenhand.test');
    const studyId = await openDemoStudy(page, 'Wayfinding cues');
    const candidates = await markableParticipants(page, studyId);
    expect(candidates.length, 'the demo has someone whose next step is open').toBeGreaterThan(0);
    const person = candidates[0] as RosterEntry;
    const step = person.nextStep as NonNullable<RosterEntry['nextStep']>;

    await page.getByRole('navigation', { name: 'Study' }).getByRole('link', { name: 'Roster' }).click();
    const roster = page.getByRole('table', { name: /^Roster/ });
    await roster.waitFor();
    await roster.getByRole('columnheader', { name: 'Next step' }).waitFor();
    await expect.poll(() => roster.getByText(/^(Due now|Overdue)$/).count()).toBeGreaterThan(0);
    await screenshotAtBothWidths(page, journey, 'roster-next-steps');

    await page.getByRole('button', { name: 'Mark a step done for a list…' }).click();
    const dialog = page.getByRole('dialog');
    await dialog.getByText('Mark a step done for a list').first().waitFor();
    await dialog.getByRole('button', { name: 'Mark done' }).click();
    await dialog.getByText('Paste at least one participant reference, one per line.').waitFor();
    await dialog.getByRole('button', { name: /^Step/ }).click();
    await page
      .getByRole('option', { name: new RegExp(`: ${step.title.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}$`) })
      .click();
    await dialog.getByLabel('Participant references, one per line').fill(`${person.reference}\nP-NOSUCH9`);
    await dialog.getByText('2 references listed.').waitFor();
    await screenshotAtBothWidths(page, journey, 'list-pasted');
    await dialog.getByRole('button', { name: 'Mark done' }).click();

    const report = dialog.getByRole('region', { name: 'Completion report' });
    await report.waitFor();
    const rows = report.getByRole('row');
    await expect.poll(() => rows.count()).toBe(3);
    const failed = rows.filter({ hasText: 'P-NOSUCH9' });
    expect(await failed.textContent()).toMatch(/Not marked.*no participant with this reference/);
    expect(await rows.filter({ hasText: person.reference }).textContent()).toMatch(/Marked done|Already done/);
    expect(await report.getByRole('list', { name: 'Completion summary' }).textContent()).toMatch(/1line not marked/);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshotAtBothWidths(page, journey, 'list-report');
    await dialog.getByRole('button', { name: 'Done', exact: true }).click();
    await page.getByRole('dialog').waitFor({ state: 'detached' });
  });

  it('a coordinator marks a step done on a participant’s record and undoes it with a reason', async () => {
    const { page } = browser;
    await signInAs(page, 'coordinator@evenhand.test');
    const studyId = await openDemoStudy(page, 'Wayfinding cues');
    const candidates = await markableParticipants(page, studyId);
    expect(candidates.length, 'the demo has someone whose next step is open').toBeGreaterThan(0);
    const person = candidates[candidates.length - 1] as RosterEntry;

    await page.goto(`${adminUrl}/studies/${studyId}/roster/${person.id}`);
    await page.getByRole('heading', { name: person.reference }).waitFor();
    const steps = page.getByRole('list', { name: 'Steps of this participant' });
    await steps.waitFor();
    await page
      .getByRole('region', { name: 'Contact log' })
      .getByText(/Unanswered reminders since the last step was done/)
      .waitFor();
    await screenshotAtBothWidths(page, journey, 'record');

    const markButton = steps.getByRole('button', { name: /^Mark step \d+ done$/ }).first();
    const position = Number(((await markButton.getAttribute('aria-label')) ?? '').match(/\d+/)?.[0]);
    await markButton.click();
    await page.getByText(`Step ${position} is marked done; its pay is owed.`).waitFor();
    const card = steps.getByRole('article', { name: new RegExp(`^Step ${position}:`) });
    await expect
      .poll(async () => (await card.textContent()) ?? '')
      .toMatch(/Marked done by staff · recorded by coordinator@evenhand\.test/);
    expect(await card.textContent()).toMatch(/Pay owed/);
    await screenshotAtBothWidths(page, journey, 'record-step-marked');

    await card.getByRole('button', { name: `Undo step ${position}` }).click();
    const undo = page.getByRole('alertdialog');
    await undo.getByText(`Undo step ${position} for ${person.reference}?`).waitFor();
    await undo.getByRole('button', { name: 'Undo the step' }).click();
    await undo.getByText(/Say in at least 5 characters why the step is undone/).waitFor();
    await undo.getByLabel('Reason (required)').fill('Marked for the wrong person during the journey check.');
    await screenshotAtBothWidths(page, journey, 'undo-dialog');
    await undo.getByRole('button', { name: 'Undo the step' }).click();
    await page.getByText(`Step ${position} is no longer done; its unapproved pay was cancelled.`).waitFor();
    await expect
      .poll(async () => (await card.textContent()) ?? '')
      .toMatch(/Undone before.*Marked for the wrong person during the journey check/);
    expect(await card.getByRole('button', { name: `Mark step ${position} done` }).isVisible()).toBe(true);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshotAtBothWidths(page, journey, 'record-step-undone');
  });

  it('a researcher compares contacts by condition on the dropout watch', async () => {
    const { page } = browser;
    await signInAs(page, 'researcher@evenhand.test');
    await openDemoStudy(page, 'Wayfinding cues');
    await page.getByRole('navigation', { name: 'Study' }).getByRole('link', { name: 'Dropout watch' }).click();
    const panel = page.getByRole('region', { name: 'Contacts by condition' });
    await panel.waitFor();
    await panel.scrollIntoViewIfNeeded();
    const table = panel.getByRole('table', { name: 'Contacts after randomization, per condition' });
    await expect.poll(() => table.getByRole('rowheader').count()).toBe(3);
    expect(await table.getByRole('columnheader').allTextContents()).toEqual([
      'Condition',
      'Participants',
      'Contacts',
      'Mean per participant',
      'Reminders',
      'Re-consent requests',
      'Staff messages',
    ]);
    expect(await page.getByTestId('contacts-test').textContent()).toMatch(
      /Welch's test: (F\(\d+, [\d.]+\) = [\d.]+, p [=<>]|not computable \(.+\))/,
    );
    expect(await panel.getByText(/screening aid, not the study's analysis/).isVisible()).toBe(true);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshotAtBothWidths(page, journey, 'watch-contacts');
  });
});
