import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import { launchPhoneBrowser, type PhoneBrowser } from './support/browser';
import { e2eEnv } from './support/env';
import { messagesTo, signInLinkIn, waitForMessageTo } from './support/mailbox';
import { answerScreeningQuestion, type ScreeningQuestion } from './support/screening';
import { screenshotTaker } from './support/screenshots';
import { confirmCardPayment, eventually, StaffApi } from './support/staff-api';

/** What a payment provider's own identifiers look like (transfers, accounts, payment intents, events). */
const PROVIDER_ID = /\b(?:tr|acct|pi|evt)_[A-Za-z0-9]/;

/**
 * The recruiting demo study whose one step is done in the lab's task (the demo task stand-in), which shows each
 * participant their own completion code at its end; seeded by the api's demo scenario.
 */
const studySlug = 'checkout-flows';

type Step = { id: string; position: number; title: string; payMinor: number };
type Payout = {
  id: string;
  reference: string;
  kind: string;
  stepTitle: string | null;
  amountMinor: number;
  status: string;
};
type Budget = { fundedMinor: number; remainingMinor: number };

describe('participant gets paid: payout setup on the provider’s page, a step completed with its code, paid with a receipt', () => {
  let browser: PhoneBrowser;
  const shoot = screenshotTaker('getting-paid');
  // Unique per run, so the mailbox match cannot pick up another run's message.
  const email = `paid.${Date.now()}.${Math.random().toString(36).slice(2, 8)}@example.test`;

  beforeAll(async () => {
    browser = await launchPhoneBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('joins, signs, sets up payouts, finishes step 1 with its code, and is paid once the coordinator approves', async () => {
    const { page } = browser;

    // 1. The study page, then the e-mailed sign-in link, which brings them back to it.
    await page.goto(`${e2eEnv.portalUrl}/s/${studySlug}`);
    await page.getByRole('heading', { level: 1, name: 'Checkout flows' }).waitFor();
    await page.getByRole('link', { name: 'Take part' }).click();
    await page.getByLabel('Your e-mail address').fill(email);
    await page.getByRole('button', { name: 'Send me a sign-in link' }).click();
    await page.getByRole('heading', { name: 'Check your inbox' }).waitFor();
    const link = signInLinkIn(await waitForMessageTo(email));
    await page.goto(`${e2eEnv.portalUrl}${link.pathname}${link.search}`);
    await page.waitForURL(`**/s/${studySlug}`);
    await page.getByText(email).waitFor();
    await shoot(page, 'study-page-signed-in');

    // 2. Join and answer every screening question.
    await page.getByRole('button', { name: 'Take part' }).click();
    await page.getByRole('heading', { name: 'A few questions first' }).waitFor();
    const studyId = (await pageApi<{ id: string }>(page, `/api/public/studies/${studySlug}`)).id;
    const enrollment = await pageApi<{ reference: string; screening: { questions: ScreeningQuestion[] } }>(
      page,
      `/api/studies/${studyId}/enrollments/me`,
    );
    for (const question of enrollment.screening.questions) {
      await answerScreeningQuestion(page, question);
    }
    await shoot(page, 'screening-answered');
    await page.getByRole('button', { name: 'Save my answers' }).click();

    // 3. Read the consent form through and sign it with a typed name.
    await page.getByRole('button', { name: 'Read the full form' }).click();
    for (let section = 0; section < 40; section += 1) {
      const next = page.getByRole('button', { name: /^(Next: .+|Continue to signing)$/ });
      const label = await next.textContent();
      await next.click();
      if (label === 'Continue to signing') break;
    }
    await page.getByLabel('Your full name').fill('Sam Rivera-Lund');
    await page.getByRole('button', { name: 'Sign the form' }).click();
    await page.getByText('You have signed the consent form').waitFor();
    await page.getByRole('heading', { name: 'Your steps' }).waitFor();
    await page.getByText('Earned so far').waitFor();
    await shoot(page, 'steps-after-signing');

    // 4. "Getting paid" from the steps: nothing set up yet, nothing earned yet.
    await page.getByRole('link', { name: 'Getting paid' }).click();
    await page.waitForURL('**/payouts');
    await page.getByRole('heading', { level: 1, name: 'Getting paid' }).waitFor();
    await page.getByText('Not set up yet').waitFor();
    await page.getByText('No payments yet').waitFor();
    expect(await page.getByRole('link', { name: 'Getting paid' }).getAttribute('aria-current')).toBe('page');
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'getting-paid-not-set-up');

    // 5. "Set up how you get paid" leaves for the payment service's hosted page.
    await page.getByRole('button', { name: 'Set up how you get paid' }).click();
    await page.waitForURL((url) => url.origin === e2eEnv.paymentsUrl);
    await page.getByRole('heading', { name: 'Where your payments go' }).waitFor();
    await page.getByText('Local stand-in for the payment provider.').waitFor();
    await shoot(page, 'provider-onboarding-page');
    await page.getByLabel('Name on your bank account').fill('Sam Rivera-Lund');
    await page.getByLabel(/These details are right/).check();
    await shoot(page, 'provider-onboarding-filled');
    await page.getByRole('button', { name: 'Save and go back' }).click();

    // 6. Back on the portal: it checks with the service and says they are set up.
    await page.waitForURL((url) => url.pathname === '/payouts' && url.searchParams.get('onboarding') === 'done');
    await page.getByText('You’re set up').waitFor({ timeout: 15_000 });
    const setup = page.getByRole('region', { name: 'How you get paid' });
    await setup.getByText('Set up', { exact: true }).waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'getting-paid-set-up');
    expect(await pageApi<{ payoutsEnabled: boolean }>(page, '/api/me/payout-account')).toMatchObject({
      payoutsEnabled: true,
    });

    // 7. The coordinator's view of the study, for the staff side later on.
    const coordinator = await StaffApi.signIn('coordinator@evenhand.test', 'evenhand-demo');
    const studies = await coordinator.request<{ items: { id: string; slug: string }[] }>('GET', '/api/studies');
    expect(studies.items.find((study) => study.slug === studySlug)?.id).toBe(studyId);
    const steps = await coordinator.request<{ items: Step[] }>('GET', `/api/studies/${studyId}/steps`);
    const firstStep = [...steps.items].sort((a, b) => a.position - b.position)[0];
    if (!firstStep) throw new Error('The demo study has no steps');

    // 8. The task shows the participant their own code at its end; they come back without its Finish button and type
    //    it on the study page: a wrong code is refused at the field, the right one (in any case) completes the step.
    await page.goto(`${e2eEnv.portalUrl}/s/${studySlug}`);
    const stepOne = page
      .getByRole('listitem')
      .filter({ has: page.getByRole('heading', { name: `Step 1 · ${firstStep.title}` }) });
    await stepOne.getByRole('button', { name: 'Open the task' }).click();
    await page.waitForURL((url) => url.origin === new URL(e2eEnv.demoTaskUrl).origin);
    const codeCard = page.getByRole('region', { name: 'Your completion code' });
    const completionCode = (await codeCard.locator('p').first().textContent())?.trim() ?? '';
    expect(completionCode).toBe(new URL(page.url()).searchParams.get('code'));
    await shoot(page, 'task-shows-code');
    await page.goBack();
    await page.waitForURL(`**/s/${studySlug}`);
    await stepOne.getByLabel('Completion code').fill('SHOP-WRONG');
    await stepOne.getByRole('button', { name: 'I finished this step' }).click();
    await stepOne.getByText('Does not match; check it and try again.').waitFor();
    await shoot(page, 'completion-code-wrong');
    await stepOne.getByLabel('Completion code').fill(completionCode.toLowerCase());
    await shoot(page, 'completion-code-entered');
    await stepOne.getByRole('button', { name: 'I finished this step' }).click();
    await stepOne.getByText('Thank you: step 1 is done').waitFor();
    await stepOne.getByText('Done', { exact: true }).waitFor();
    expect(
      await stepOne
        .locator('p')
        .filter({ hasText: /^\$[\d.,]+ earned$/ })
        .textContent(),
    ).toBe('$25.00 earned');
    expect(await page.getByText('Earned so far').locator('..').textContent()).toContain('$25.00');
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'step-one-done');

    // 9. "Getting paid" shows it owed, waiting for approval.
    await page.getByRole('link', { name: 'Getting paid' }).click();
    await page.waitForURL('**/payouts');
    const pay = page.getByRole('region', { name: 'Your pay' });
    await pay.getByText('Waiting for approval').waitFor();
    expect(await pay.getByText('Owed to you').locator('..').textContent()).toContain('$25.00');
    expect(await pay.getByRole('listitem').filter({ hasText: firstStep.title }).textContent()).toContain('$25.00');
    await shoot(page, 'getting-paid-owed');

    // 10. The coordinator funds the study by card and approves this payout (the admin journey does this on screen).
    const funding = await coordinator.request<{ fundingId: string; clientSecret: string }>(
      'POST',
      `/api/studies/${studyId}/funding`,
      {
        amountMinor: 10_000,
      },
    );
    const fundedBefore = (await coordinator.request<Budget>('GET', `/api/studies/${studyId}/budget`)).fundedMinor;
    await confirmCardPayment(funding.clientSecret);
    await eventually('the card payment to fund the study', async () => {
      const budget = await coordinator.request<Budget>('GET', `/api/studies/${studyId}/budget`);
      if (budget.fundedMinor >= fundedBefore + 10_000) return budget;
      // The webhook may lag; asking the api to look at the payment itself is what the admin's page does too.
      await coordinator.request('POST', `/api/studies/${studyId}/funding/${funding.fundingId}/refresh`);
      return undefined;
    });
    const payout = await eventually('the owed payout for step 1', async () => {
      const owed = await coordinator.request<{ items: Payout[] }>(
        'GET',
        `/api/studies/${studyId}/payouts?status=owed&pageSize=500`,
      );
      return owed.items.find((item) => item.reference === enrollment.reference && item.kind === 'step');
    });
    expect(payout).toMatchObject({ amountMinor: firstStep.payMinor, stepTitle: firstStep.title });
    await coordinator.request('POST', `/api/studies/${studyId}/payouts/approve`, { payoutIds: [payout.id] });

    // 11. The participant sees it paid, with a receipt number, and the receipt arrives by e-mail.
    const receiptNumber = await eventually('the payout to be paid', async () => {
      const mine = await pageApi<{ items: { id: string; status: string; receipt: string | null }[] }>(
        page,
        '/api/me/payouts',
      );
      const item = mine.items.find((entry) => entry.id === payout.id);
      return item?.status === 'paid' && item.receipt ? item.receipt : undefined;
    });
    await page.reload();
    const paidRow = page
      .getByRole('region', { name: 'Your pay' })
      .getByRole('listitem')
      .filter({ hasText: firstStep.title });
    await paidRow.getByText('Paid', { exact: true }).waitFor();
    await paidRow.getByText(receiptNumber).waitFor();
    // Our own receipt number (study slug and a count), never the provider's ids, on the page or in the e-mail.
    expect(receiptNumber).toMatch(new RegExp(`^${studySlug}-\\d{4,}$`));
    expect(await page.locator('body').innerText()).not.toMatch(PROVIDER_ID);
    expect(await pay.getByText('Paid to you', { exact: true }).locator('..').textContent()).toContain('$25.00');
    const thisYear = page.getByRole('region', { name: 'This year' });
    expect(
      await thisYear
        .getByText(/^Paid to you in \d{4}$/)
        .locator('..')
        .textContent(),
    ).toContain('$25.00');
    await thisYear.getByText(/finance office decides/).waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await shoot(page, 'getting-paid-paid');

    const receipt = await waitForMessageTo(email, { subject: /^Receipt/ });
    expect(receipt.subject).toContain('$25.00');
    expect(receipt.text).toContain(receiptNumber);
    expect(`${receipt.subject}\n${receipt.text}`).not.toMatch(PROVIDER_ID);
    // Nor in any other e-mail this participant was sent (sign-in links, the signed form, the receipt).
    const mail = await messagesTo(email);
    expect(mail.length).toBeGreaterThanOrEqual(2);
    for (const message of mail)
      expect(`${message.subject}\n${message.text}\n${message.html}`, message.subject).not.toMatch(PROVIDER_ID);
    for (const path of [`/s/${studySlug}`, '/payouts', '/studies']) {
      await page.goto(`${e2eEnv.portalUrl}${path}`);
      await page.locator('main').first().waitFor();
      expect(await page.locator('body').innerText(), path).not.toMatch(PROVIDER_ID);
    }
  });
});

/** Through the page's own session cookies, as the portal would ask. */
async function pageApi<T>(page: PhoneBrowser['page'], path: string): Promise<T> {
  const response = await page.request.get(`${e2eEnv.portalUrl}${path}`);
  if (!response.ok()) throw new Error(`GET ${path} answered ${response.status()}: ${await response.text()}`);
  return (await response.json()) as T;
}
