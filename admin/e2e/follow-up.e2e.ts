import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import {
  adminUrl,
  openBrowser,
  screenshotAtBothWidths,
  signIn,
  transitionsSettled,
  type BrowserSession,
} from './support/browser';

const journey = 'follow-up';

interface RosterEntry {
  id: string;
  reference: string;
  name: string | null;
  status: string;
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

/** Someone assigned and taking part, read through the api with the browser's own session. */
async function someoneTakingPart(page: Page, studyId: string): Promise<RosterEntry> {
  const response = await page.request.get(
    `${adminUrl}/api/studies/${studyId}/enrollments?status=assigned&pageSize=200`,
  );
  expect(response.status()).toBe(200);
  const { items } = (await response.json()) as { items: RosterEntry[] };
  const person = items[0];
  if (!person) throw new Error('The demo study has nobody assigned');
  return person;
}

async function lostCount(page: Page, studyId: string): Promise<number> {
  const response = await page.request.get(`${adminUrl}/api/studies/${studyId}/attrition`);
  expect(response.status()).toBe(200);
  const report = (await response.json()) as { flow: { arms: { lostToFollowUp: { total: number } }[] } };
  return report.flow.arms.reduce((sum, arm) => sum + arm.lostToFollowUp.total, 0);
}

describe('lost to follow-up, and back', () => {
  let browser: BrowserSession;
  beforeAll(async () => {
    browser = await openBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('a coordinator marks someone lost from the roster and puts them back from their record with a reason', async () => {
    const { page } = browser;
    await page.goto(`${adminUrl}/sign-in`);
    await signIn(page, 'coordinator@evenhand.test');
    await page.getByRole('heading', { name: 'Studies', level: 1 }).waitFor();
    const studyId = await openDemoStudy(page, 'Wayfinding cues');
    const person = await someoneTakingPart(page, studyId);
    const lostBefore = await lostCount(page, studyId);

    await page.goto(`${adminUrl}/studies/${studyId}/roster?q=${encodeURIComponent(person.reference)}`);
    const roster = page.getByRole('table').first();
    await roster
      .getByRole('button', { name: /lost to follow-up$/ })
      .first()
      .click();
    const mark = page.getByRole('alertdialog');
    await mark.getByLabel('Reason').fill('No reply to three reminders over two weeks');
    await mark.getByRole('button', { name: 'Mark lost to follow-up' }).click();
    await page.getByText(`${person.reference} is marked lost to follow-up.`).waitFor();
    await roster.getByRole('button', { name: /back to taking part$/ }).waitFor();
    await transitionsSettled(page);
    await screenshotAtBothWidths(page, journey, 'roster-lost-with-undo');
    expect(await lostCount(page, studyId)).toBe(lostBefore + 1);

    await page.goto(`${adminUrl}/studies/${studyId}/roster/${person.id}`);
    await page.getByRole('heading', { name: person.reference }).waitFor();
    await page.getByRole('button', { name: 'Undo lost to follow-up' }).click();
    const undo = page.getByRole('alertdialog');
    // The dialog names the person by the name they signed with, or by reference when there is none.
    await undo.getByText(`Put ${person.name ?? person.reference} back to taking part?`).waitFor();
    await undo.getByRole('button', { name: 'Put back to taking part' }).click();
    await undo.getByText(/Say in a few words why they are taking part again/).waitFor();
    await undo.getByLabel('Reason').fill('She answered the fourth reminder and wants to go on.');
    await transitionsSettled(page);
    await screenshotAtBothWidths(page, journey, 'undo-lost-dialog');
    await undo.getByRole('button', { name: 'Put back to taking part' }).click();
    await page.getByText(`${person.reference} is taking part again.`).waitFor();
    await expect.poll(() => page.getByText('Why lost to follow-up').count()).toBe(0);
    await page
      .getByText(/back to taking part, because “She answered the fourth reminder/)
      .first()
      .waitFor();
    expect(await lostCount(page, studyId)).toBe(lostBefore);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await transitionsSettled(page);
    await screenshotAtBothWidths(page, journey, 'record-back-to-taking-part');
  });
});
