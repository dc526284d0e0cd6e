import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import { adminUrl, openBrowser, screenshotAtBothWidths, signIn, type BrowserSession } from './support/browser';

const journey = 'passwords';
const mailboxUrl = (process.env.MAILBOX_URL ?? 'http://127.0.0.1:1080').replace(/\/+$/, '');

/** The newest reset link the local mailbox holds for this address. */
async function resetLinkFor(email: string): Promise<string | undefined> {
  const messages = (await (await fetch(`${mailboxUrl}/api/email`)).json()) as Array<{
    subject: string;
    text: string;
    to: Array<{ address: string }>;
  }>;
  const mine = messages.filter((m) => m.to.some((to) => to.address === email) && /password/i.test(m.subject));
  return /(https?:\/\/\S+\/reset-password\?token=[A-Za-z0-9_-]+)/.exec(mine.at(-1)?.text ?? '')?.[1];
}

describe('a new staff member changes the temporary password, then resets a forgotten one by e-mail', () => {
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

  it('changes the password with the current one, and sets a new one from a single-use link', async () => {
    const stamp = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`;
    const email = `pw-${stamp}@evenhand.test`;
    const name = `Noa Keyholder ${stamp}`;

    const { page } = adminBrowser;
    await page.goto(`${adminUrl}/sign-in`);
    await signIn(page, 'admin@evenhand.test');
    await page.getByRole('heading', { name: 'Staff', level: 1 }).waitFor();
    await page.getByRole('button', { name: 'Add staff member' }).first().click();
    const createDialog = page.getByRole('dialog');
    await createDialog.getByLabel('Name', { exact: true }).fill(name);
    await createDialog.getByLabel('E-mail', { exact: true }).fill(email);
    await createDialog.getByRole('button', { name: /^Role/ }).click();
    await page.getByRole('option', { name: /Researcher/ }).click();
    await createDialog.getByLabel('Temporary password').fill('temporary-password-1');
    await createDialog.getByRole('button', { name: 'Add staff member' }).click();
    await page.getByText(`${name} was added as researcher.`).waitFor();

    const member = memberBrowser.page;
    await member.goto(`${adminUrl}/sign-in`);
    await signIn(member, email, 'temporary-password-1');
    await member.getByRole('link', { name: 'Your account' }).click();
    await member.getByRole('heading', { name: 'Your account', level: 1 }).waitFor();

    const form = member.getByRole('form', { name: 'Change your password' });
    await form.getByLabel('Current password').fill('not-my-password');
    await form.getByLabel('New password', { exact: true }).fill('chosen-by-me-2026');
    await form.getByLabel('New password again').fill('chosen-by-me-2027');
    await form.getByRole('button', { name: 'Change password' }).click();
    await form.getByText('The two new passwords differ.').waitFor();
    await form.getByLabel('New password again').fill('chosen-by-me-2026');
    await form.getByRole('button', { name: 'Change password' }).click();
    await form.getByText('That is not your current password.').waitFor();
    expect(await seriousAccessibilityProblems(member)).toEqual([]);
    await screenshotAtBothWidths(member, journey, 'change-refused');

    await form.getByLabel('Current password').fill('temporary-password-1');
    await form.getByRole('button', { name: 'Change password' }).click();
    await member.getByText('Your password was changed.').waitFor();
    await screenshotAtBothWidths(member, journey, 'changed');

    // Forgotten later: sign out, ask for a link, and choose a new password from it.
    await member.getByRole('button', { name: 'Sign out' }).click();
    await member.getByRole('heading', { name: 'Sign in' }).waitFor();
    await member.getByRole('link', { name: 'Forgot your password?' }).click();
    // Fill the request form itself: the sign-in page has an E-mail field too, and it can still be on screen while the
    // request page loads.
    const requestForm = member.getByRole('form', { name: 'Ask for a password link' });
    await requestForm.getByLabel('E-mail').fill(email);
    await requestForm.getByRole('button', { name: 'Send me a link' }).click();
    await member.getByText(/a link to choose a new password is on its way/).waitFor();
    await screenshotAtBothWidths(member, journey, 'link-requested');

    await expect.poll(() => resetLinkFor(email), { timeout: 30_000 }).toMatch(/reset-password\?token=/);
    const link = (await resetLinkFor(email))!;
    await member.goto(`${adminUrl}${new URL(link).pathname}${new URL(link).search}`);
    await member.getByRole('heading', { name: 'Choose a new password' }).waitFor();
    await member.getByLabel('New password', { exact: true }).fill('reset-by-mail-2026');
    await member.getByLabel('New password again').fill('reset-by-mail-2026');
    await screenshotAtBothWidths(member, journey, 'choose-new');
    await member.getByRole('button', { name: 'Set new password' }).click();
    await member.getByText('Your new password is set').waitFor();

    // The link works once.
    await member.reload();
    await member.getByLabel('New password', { exact: true }).fill('another-password-2026');
    await member.getByLabel('New password again').fill('another-password-2026');
    await member.getByRole('button', { name: 'Set new password' }).click();
    await member.getByText(/This link cannot be used any more/).waitFor();
    await screenshotAtBothWidths(member, journey, 'link-used');

    await member.goto(`${adminUrl}/sign-in`);
    await signIn(member, email, 'chosen-by-me-2026');
    await member.getByText('That e-mail and password do not match an active staff account.').waitFor();
    await signIn(member, email, 'reset-by-mail-2026');
    await member.getByRole('heading', { name: 'Studies', level: 1 }).waitFor();
  });
});
