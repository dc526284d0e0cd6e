import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import { adminUrl, openBrowser, screenshotAtBothWidths, signIn, type BrowserSession } from './support/browser';

const journey = 'membership';

describe('an admin gives a new staff member a study', () => {
  let adminBrowser: BrowserSession;
  let memberBrowser: BrowserSession;

  beforeAll(async () => {
    adminBrowser = await openBrowser();
    memberBrowser = await openBrowser();
  });

  afterAll(async () => {
    await adminBrowser?.close();
    await memberBrowser?.close();
  });

  it('creates the account, adds them to a study with the role that fits, and the new member then sees that study', async () => {
    const { page } = adminBrowser;
    const stamp = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`;
    const email = `member-${stamp}@evenhand.test`;
    const name = `Lior Newcomer ${stamp}`;
    const password = 'journey-password-1';

    await page.goto(`${adminUrl}/sign-in`);
    await signIn(page, 'admin@evenhand.test');
    await page.getByRole('heading', { name: 'Staff', level: 1 }).waitFor();
    await page.getByRole('button', { name: 'Add staff member' }).first().click();
    const createDialog = page.getByRole('dialog');
    await createDialog.getByLabel('Name', { exact: true }).fill(name);
    await createDialog.getByLabel('E-mail', { exact: true }).fill(email);
    await createDialog.getByRole('button', { name: /^Role/ }).click();
    await page.getByRole('option', { name: /Coordinator/ }).click();
    await createDialog.getByLabel('Temporary password').fill(password);
    await createDialog.getByRole('button', { name: 'Add staff member' }).click();
    await page.getByText(`${name} was added as coordinator.`).waitFor();

    // Before any study: the new member signs in and sees none.
    const member = memberBrowser.page;
    await member.goto(`${adminUrl}/sign-in`);
    await signIn(member, email, password);
    await member.getByRole('heading', { name: 'Studies', level: 1 }).waitFor();
    await member.getByText('No studies yet').waitFor();

    // The person's page in the staff area, reached from the table.
    await page.getByRole('searchbox', { name: 'Search staff by name or e-mail' }).fill(email);
    await page.getByRole('link', { name }).click();
    await page.getByRole('heading', { name, level: 1 }).waitFor();
    await page.getByText('No studies yet').waitFor();
    await screenshotAtBothWidths(page, journey, 'person-without-studies');

    await page.getByRole('button', { name: 'Add to a study' }).click();
    await page.getByText(`Give ${name} a study`).waitFor();
    const addDialog = page.getByRole('dialog');
    // A coordinator can only join as a coordinator: the role is chosen and nothing else is offered.
    await addDialog.getByRole('button', { name: /^Role in the study/ }).click();
    await expect
      .poll(() => page.getByRole('option').allTextContents())
      .toEqual([expect.stringMatching(/^Coordinator/)]);
    await page.keyboard.press('Escape');
    await addDialog.getByRole('button', { name: 'Add to study' }).click();
    await addDialog.getByText('Choose a study.').waitFor();
    await addDialog.getByRole('button', { name: /^Study/ }).click();
    await page.getByRole('option', { name: /Wayfinding cues/ }).click();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshotAtBothWidths(page, journey, 'add-to-study');
    await addDialog.getByRole('button', { name: 'Add to study' }).click();
    await page.getByText(`${name} was added to Wayfinding cues.`).waitFor();
    const studyRow = page.getByRole('row').filter({ hasText: 'Wayfinding cues' });
    await studyRow.getByText('Coordinator', { exact: true }).waitFor();
    await screenshotAtBothWidths(page, journey, 'person-with-study');

    // The new member now finds the study in their list and can open it.
    await member.reload();
    await member.getByRole('table', { name: 'Your studies' }).getByRole('link', { name: 'Wayfinding cues' }).click();
    await member.getByRole('heading', { name: 'Wayfinding cues' }).first().waitFor();
    // Membership is read-only for them: the list is there, the admin's buttons are not.
    const membersPanel = member.getByRole('region', { name: 'Members' });
    await membersPanel.getByRole('cell', { name }).waitFor();
    expect(await membersPanel.getByRole('button', { name: 'Add member' }).count()).toBe(0);
    expect(await membersPanel.getByRole('button', { name: /^Remove/ }).count()).toBe(0);
    await membersPanel.scrollIntoViewIfNeeded();
    await screenshotAtBothWidths(member, journey, 'member-sees-study');

    // The admin removes them from the study's own members panel, after confirming.
    await studyRow.getByRole('link', { name: 'Wayfinding cues' }).click();
    const adminMembers = page.getByRole('region', { name: 'Members' });
    await adminMembers.getByRole('link', { name }).waitFor();
    await screenshotAtBothWidths(page, journey, 'study-members');
    await adminMembers.getByRole('button', { name: `Remove ${name} from the study` }).click();
    await page.getByText(`Remove ${name} from Wayfinding cues?`).waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshotAtBothWidths(page, journey, 'confirm-remove');
    await page.getByRole('alertdialog').getByRole('button', { name: 'Remove from study' }).click();
    await page.getByText(`${name} was removed from the study.`).waitFor();
    await expect.poll(() => adminMembers.getByRole('link', { name }).count()).toBe(0);
    await member.goto(`${adminUrl}/studies`);
    await member.getByText('No studies yet').waitFor();

    // And the admin adds them back from the same panel, choosing the person and (for a coordinator) the only fitting role.
    await adminMembers.getByRole('button', { name: 'Add member' }).click();
    const memberDialog = page.getByRole('dialog');
    await memberDialog.getByRole('searchbox', { name: 'Find a staff member' }).fill(email);
    await memberDialog.getByRole('button', { name: /^Staff member/ }).click();
    await page.getByRole('option', { name: new RegExp(name) }).click();
    await memberDialog.getByRole('button', { name: 'Add to study' }).click();
    await page.getByText(`${name} was added to the study.`).waitFor();
    await adminMembers.getByRole('link', { name }).waitFor();

    // Removed and re-added: the member's own view follows.
    await member.goto(`${adminUrl}/studies`);
    await member.getByRole('table', { name: 'Your studies' }).getByRole('link', { name: 'Wayfinding cues' }).waitFor();
  });
});
