import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import { type JourneyBrowser, launchBrowser } from './support/browser';
import { e2eEnv } from './support/env';
import { screenshotTaker } from './support/screenshots';
import { pageApi, takePart } from './support/take-part';

/**
 * The demo study whose first session is done in the lab's own task (the demo task stand-in) and brings the
 * participant back by a signed return link; seeded by the api's demo scenario, open as soon as they sign.
 */
const studySlug = 'wayfinding-cues';

type Step = {
  id: string;
  position: number;
  title: string;
  payMinor: number;
  status: string;
  verification: string;
  hasTask: boolean;
};

describe.each(['phone', 'desktop'] as const)('doing a step in the lab’s task and coming back (%s)', (size) => {
  let browser: JourneyBrowser;
  const shoot = screenshotTaker(`task-return-${size}`);
  // Unique per run, so the mailbox match cannot pick up another run's message.
  const email = `task.${size}.${Date.now()}.${Math.random().toString(36).slice(2, 8)}@example.test`;
  /** The signed return address the task was given, kept for the checks on altered and replayed links. */
  let returnAddress: string | null = null;

  beforeAll(async () => {
    browser = await launchBrowser(size);
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('opens the task for session 1, finishes it there, and is brought back to the step done with its pay owed', async () => {
    const { page } = browser;

    // 1. Take part: sign-in link, questions, consent; then the steps.
    const { studyId, reference } = await takePart(page, {
      studySlug,
      email,
      typedName: 'Noor Vale-Okafor',
      numbers: { sense_of_direction: 40 },
    });
    const steps = (await pageApi<{ steps: Step[] }>(page, `/api/studies/${studyId}/enrollments/me`)).steps.sort(
      (a, b) => a.position - b.position,
    );
    const [first, second] = steps;
    if (!first || !second) throw new Error('The demo study should have at least two steps');
    expect(first, 'the demo’s first session is done in the lab’s task and open right after signing').toMatchObject({
      verification: 'return-link',
      hasTask: true,
      status: 'open',
    });

    const stepOne = page
      .getByRole('listitem')
      .filter({ has: page.getByRole('heading', { name: `Step 1 · ${first.title}` }) });
    const stepTwo = page
      .getByRole('listitem')
      .filter({ has: page.getByRole('heading', { name: `Step 2 · ${second.title}` }) });
    await stepOne.getByText('Ready for you', { exact: true }).waitFor();
    await stepOne.getByText(/^Do it by .+\d{4} at /).waitFor();
    await stepOne.getByText(/you are brought back here and the step is marked done/).waitFor();
    await stepTwo.getByText('Opens after you finish the previous step.').waitFor();
    expect(await stepOne.getByLabel('Completion code').count()).toBe(0);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'steps-ready');

    // 2. "Open the task" leaves for the lab's task, carrying the participant's reference and the way back.
    await stepOne.getByRole('button', { name: 'Open the task' }).click();
    const taskOrigin = new URL(e2eEnv.demoTaskUrl).origin;
    await page.waitForURL((url) => url.origin === taskOrigin);
    await page.getByRole('heading', { level: 1 }).waitFor();
    const taskAddress = new URL(page.url());
    expect(taskAddress.searchParams.get('ref')).toBe(reference);
    returnAddress = taskAddress.searchParams.get('return');
    expect(returnAddress).toMatch(new RegExp(`^${e2eEnv.portalUrl}/api/return/[^/]+$`));
    await shoot(page, 'external-task');

    // 3. Finishing there brings them back to the portal's return page: done, with the step and its pay owed.
    await page.getByRole('button', { name: /Finish/ }).click();
    await page.waitForURL((url) => url.origin === e2eEnv.portalUrl && url.pathname === '/return');
    const back = new URL(page.url());
    expect(Object.fromEntries(back.searchParams)).toEqual({ result: 'done', study: studySlug, step: first.id });
    await page.getByRole('heading', { level: 1, name: 'Thank you: your step is done' }).waitFor();
    const returned = page.getByRole('region', { name: `Step 1 · ${first.title}` });
    await returned.waitFor();
    expect(await returned.getByText('Owed to you', { exact: true }).locator('..').textContent()).toContain('$10.00');
    await returned.getByText(/^Done on /).waitFor();
    expect(await returned.getByText('Still to be paid', { exact: true }).locator('..').textContent()).toContain(
      '$10.00',
    );
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'return-done');

    // 4. The study page shows it done and earned; the next session now has its opening date.
    await page.getByRole('link', { name: 'Back to the study' }).click();
    await page.waitForURL(`**/s/${studySlug}`);
    await stepOne.getByText('Done', { exact: true }).waitFor();
    expect(
      await stepOne
        .locator('p')
        .filter({ hasText: /^\$[\d.,]+ earned$/ })
        .textContent(),
    ).toBe('$10.00 earned');
    await page.getByText(/^1 of \d+ done$/).waitFor();
    expect(await page.getByText('Still to be paid', { exact: true }).locator('..').textContent()).toContain('$10.00');
    await stepTwo.getByText(/^Opens on .+\d{4} at /).waitFor();
    expect(await stepTwo.getByRole('button', { name: 'Open the task' }).count()).toBe(0);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'study-after-return');

    // The pay is owed on the "Getting paid" page too.
    await page.getByRole('link', { name: 'Getting paid' }).first().click();
    await page.waitForURL('**/payouts');
    const pay = page.getByRole('region', { name: 'Your pay' });
    await pay.getByText('Waiting for approval').waitFor();
    expect(await pay.getByRole('listitem').filter({ hasText: first.title }).textContent()).toContain('$10.00');
  });

  it('refuses an altered return link in plain words, and shows the outcome of a return without a session', async () => {
    const { page } = browser;
    if (!returnAddress)
      throw new Error('The first journey did not reach the task, so there is no return address to alter');

    // One character of the signature changed: the portal says the link was changed, and nothing was marked.
    const altered = alterSignature(returnAddress);
    await page.goto(altered);
    await page.waitForURL((url) => url.pathname === '/return');
    expect(Object.fromEntries(new URL(page.url()).searchParams)).toEqual({
      result: 'refused',
      study: studySlug,
      reason: 'forged',
    });
    await page.getByRole('heading', { level: 1, name: 'This link was changed' }).waitFor();
    await page.getByText('Nothing was marked done.').waitFor();
    expect(await page.getByRole('link', { name: 'Go to the study page' }).getAttribute('href')).toBe(`/s/${studySlug}`);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'return-refused-altered');

    // A browser without a session: the real link again says it was already done and offers sign-in;
    // the altered one is refused there too.
    const signedOut = await launchBrowser(size);
    try {
      await signedOut.page.goto(returnAddress);
      await signedOut.page.waitForURL((url) => url.pathname === '/return');
      expect(new URL(signedOut.page.url()).searchParams.get('result')).toBe('already-done');
      await signedOut.page.getByRole('heading', { level: 1, name: 'This step was already done' }).waitFor();
      expect(await signedOut.page.getByRole('link', { name: 'Sign in to see your steps' }).getAttribute('href')).toBe(
        `/sign-in?study=${studySlug}`,
      );
      expect(await seriousAccessibilityProblems(signedOut.page)).toEqual([]);
      await shoot(signedOut.page, 'return-already-done-signed-out');

      await signedOut.page.goto(altered);
      await signedOut.page.getByRole('heading', { level: 1, name: 'This link was changed' }).waitFor();
      await signedOut.page.getByRole('link', { name: 'Sign in', exact: true }).waitFor();
      await shoot(signedOut.page, 'return-refused-signed-out');
    } finally {
      await signedOut.close();
    }
  });
});

/** The return address with one character in the middle of its signature swapped (base64url, 43 characters). */
function alterSignature(address: string): string {
  const url = new URL(address);
  const token = decodeURIComponent(url.pathname.split('/').at(-1) ?? '');
  const at = token.length - 20;
  const swapped = token[at] === 'A' ? 'B' : 'A';
  url.pathname = url.pathname.replace(
    /[^/]+$/,
    encodeURIComponent(`${token.slice(0, at)}${swapped}${token.slice(at + 1)}`),
  );
  return url.toString();
}
