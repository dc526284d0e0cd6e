import { afterAll, beforeAll, describe, it } from 'vitest';
import { adminUrl, openBrowser, signIn, transitionsSettled, type BrowserSession } from './support/browser';

// Someone who opens a list or a dialog and closes it again at once (a double click, a quick Escape) must get the
// screen back: nothing left half-shown over the page, catching clicks.
describe('lists and dialogs closed the moment they open', () => {
  let session: BrowserSession;

  beforeAll(async () => {
    session = await openBrowser();
  });
  afterAll(async () => {
    await session?.close();
  });

  it('leave nothing behind on the page', async () => {
    const { page } = session;
    await page.goto(`${adminUrl}/sign-in`);
    await signIn(page, 'admin@evenhand.test');
    await page.getByRole('heading', { name: 'Staff', level: 1 }).waitFor();

    for (let round = 0; round < 8; round++) {
      await page.getByRole('button', { name: 'Add staff member' }).first().click();
      const dialog = page.getByRole('dialog');
      const roleButton = dialog.getByRole('button', { name: /^Role/ });
      // Open the list and close it within the same moment, as a quick Escape does.
      await roleButton.click();
      await page.keyboard.press('Escape');
      await transitionsSettled(page);
      // Open the list and pick an option straight away.
      await roleButton.click();
      await page.getByRole('option', { name: /Coordinator/ }).click();
      await transitionsSettled(page);
      await page.keyboard.press('Escape');
      await dialog.waitFor({ state: 'detached' });
      // Open the dialog and close it at once.
      await page.getByRole('button', { name: 'Add staff member' }).first().click();
      await page.keyboard.press('Escape');
      await transitionsSettled(page);
      await page.getByRole('dialog').waitFor({ state: 'detached' });
    }
    // Nothing is left over the page: the heading's button takes a click again.
    await page.getByRole('button', { name: 'Add staff member' }).first().click();
    await page.getByRole('dialog').getByLabel('Name', { exact: true }).waitFor();
  });
});
