import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import { adminUrl, openBrowser, screenshot, signIn, type BrowserSession } from './support/browser';

const journey = 'admin-staff';

describe('an admin manages staff accounts', () => {
  let browser: BrowserSession;

  beforeAll(async () => {
    browser = await openBrowser();
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('creates a staff member, finds them in the table and deactivates them after confirming', async () => {
    const { page } = browser;
    const stamp = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`;
    const email = `e2e-${stamp}@evenhand.test`;
    const name = `Journey Tester ${stamp}`;

    await page.goto(`${adminUrl}/sign-in`);
    await signIn(page, 'admin@evenhand.test');
    await page.getByRole('heading', { name: 'Staff', level: 1 }).waitFor();
    await page.getByRole('cell', { name: 'admin@evenhand.test' }).waitFor();
    expect(new URL(page.url()).pathname).toBe('/staff');
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'staff-table');

    await page.getByRole('button', { name: 'Add staff member' }).first().click();
    await page.getByText('Add a staff member').waitFor();
    await page.getByRole('button', { name: 'Add staff member' }).last().click();
    await page.getByText('Choose a role.').waitFor();
    await screenshot(page, journey, 'create-errors');

    const dialog = page.getByRole('dialog');
    await dialog.getByLabel('Name', { exact: true }).fill(name);
    await dialog.getByLabel('E-mail', { exact: true }).fill(email);
    await dialog.getByRole('button', { name: /^Role/ }).click();
    await page.getByRole('option', { name: /Auditor/ }).click();
    await dialog.getByLabel('Temporary password').fill('journey-password-1');
    await screenshot(page, journey, 'create-filled');
    await dialog.getByRole('button', { name: 'Add staff member' }).click();
    await page.getByText(`${name} was added as auditor.`).waitFor();

    await page.getByRole('searchbox', { name: 'Search staff by name or e-mail' }).fill(email);
    await page.waitForURL((url) => url.searchParams.get('q') === email);
    const row = page.getByRole('row').filter({ hasText: email });
    await row.waitFor();
    // The earlier rows stay on screen until the search answers; then only the header and the new person remain.
    await expect.poll(() => page.getByRole('row').count()).toBe(2);
    expect(await row.getByText('Active', { exact: true }).isVisible()).toBe(true);
    await screenshot(page, journey, 'found-new-member');

    await page.getByRole('button', { name: `Deactivate ${name}` }).click();
    await page.getByText(`Deactivate ${name}?`).waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'confirm-deactivate');

    await page.getByRole('alertdialog').getByRole('button', { name: 'Deactivate', exact: true }).click();
    await page.getByText(`${name} was deactivated.`).waitFor();
    await row.getByText('Deactivated', { exact: true }).waitFor();
    expect(await page.getByRole('button', { name: `Reactivate ${name}` }).isVisible()).toBe(true);
    await screenshot(page, journey, 'deactivated');
  });
});
