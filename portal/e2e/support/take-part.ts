import type { Page } from 'playwright-core';
import { e2eEnv } from './env';
import { signInLinkIn, waitForMessageTo } from './mailbox';
import { answerScreeningQuestion, type ScreeningQuestion } from './screening';

/** Through the page's own session cookies, as the portal would ask. */
export async function pageApi<T>(page: Page, path: string): Promise<T> {
  const response = await page.request.get(`${e2eEnv.portalUrl}${path}`);
  if (!response.ok()) throw new Error(`GET ${path} answered ${response.status()}: ${await response.text()}`);
  return (await response.json()) as T;
}

/**
 * From the study link to signed consent, the way a participant does it: e-mailed sign-in link, join, every screening
 * question answered so as to be eligible, the consent form read through, signed with a typed name. Ends on the study
 * page with the steps showing. The consent journey checks each of these screens closely; here they are the way in.
 */
export async function takePart(
  page: Page,
  {
    studySlug,
    email,
    typedName,
    numbers = {},
    shoot,
  }: {
    studySlug: string;
    email: string;
    typedName: string;
    numbers?: Record<string, number>;
    shoot?: (page: Page, name: string) => Promise<unknown>;
  },
): Promise<{ studyId: string; reference: string }> {
  await page.goto(`${e2eEnv.portalUrl}/s/${studySlug}`);
  await page.getByRole('link', { name: 'Take part' }).click();
  await page.getByLabel('Your e-mail address').fill(email);
  await page.getByRole('button', { name: 'Send me a sign-in link' }).click();
  await page.getByRole('heading', { name: 'Check your inbox' }).waitFor();
  const link = signInLinkIn(await waitForMessageTo(email));
  await page.goto(`${e2eEnv.portalUrl}${link.pathname}${link.search}`);
  await page.waitForURL(`**/s/${studySlug}`);
  await page.getByText(email).waitFor();
  await shoot?.(page, 'study-page-signed-in');

  await page.getByRole('button', { name: 'Take part' }).click();
  await page.getByRole('heading', { name: 'A few questions first' }).waitFor();
  const studyId = (await pageApi<{ id: string }>(page, `/api/public/studies/${studySlug}`)).id;
  const enrollment = await pageApi<{ reference: string; screening: { questions: ScreeningQuestion[] } }>(
    page,
    `/api/studies/${studyId}/enrollments/me`,
  );
  for (const question of enrollment.screening.questions) await answerScreeningQuestion(page, question, numbers);
  await page.getByRole('button', { name: 'Save my answers' }).click();

  await page.getByRole('button', { name: 'Read the full form' }).click();
  for (let section = 0; section < 40; section += 1) {
    const next = page.getByRole('button', { name: /^(Next: .+|Continue to signing)$/ });
    const label = await next.textContent();
    await next.click();
    if (label === 'Continue to signing') break;
  }
  await page.getByLabel('Your full name').fill(typedName);
  await page.getByRole('button', { name: 'Sign the form' }).click();
  await page.getByText('You have signed the consent form').waitFor();
  await page.getByRole('heading', { name: 'Your steps' }).waitFor();
  return { studyId, reference: enrollment.reference };
}
