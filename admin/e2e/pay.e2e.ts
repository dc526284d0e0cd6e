import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { seriousAccessibilityProblems } from './support/accessibility';
import { readFileSync } from 'node:fs';
import {
  adminUrl,
  openBrowser,
  screenshot,
  screenshotAtBothWidths,
  signIn,
  type BrowserSession,
} from './support/browser';

const journey = 'pay';

/** A group of the payout queue, by its title. */
const group = (page: Page, title: string) =>
  page
    .getByRole('list', { name: 'Payouts by what happens next' })
    .getByRole('button', { name: new RegExp(`^${title}`) });

/** What a group's heading says: "3 payouts · 2 participants · $30.00", or none. */
async function groupTotals(page: Page, title: string): Promise<{ payouts: number; amount: number }> {
  const text = (await group(page, title).textContent()) ?? '';
  const match = /(\d+) payouts? · \d+ participants? · \$([\d,.]+)/.exec(text);
  return match ? { payouts: Number(match[1]), amount: dollars(match[2] ?? null) } : { payouts: 0, amount: 0 };
}

const dollars = (text: string | null) => Number((text ?? '').replace(/[^0-9.]/g, ''));
const cents = (value: number) => Math.round(value * 100);

describe('paying participants', () => {
  let browser: BrowserSession;

  beforeAll(async () => {
    browser = await openBrowser();
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('a coordinator funds a study by card, approves what is owed, watches it settle and reconciles with the provider', async () => {
    const { page } = browser;

    await page.goto(`${adminUrl}/sign-in`);
    await signIn(page, 'coordinator@evenhand.test');
    await page.getByRole('heading', { name: 'Studies', level: 1 }).waitFor();
    await page.getByRole('link', { name: 'Wayfinding cues' }).click();
    await page.getByRole('heading', { name: 'Wayfinding cues', level: 1 }).waitFor();
    await page.getByRole('link', { name: 'Pay', exact: true }).click();
    await page.waitForURL((url) => /\/studies\/[0-9a-f-]{36}\/pay$/.test(url.pathname));
    await page.getByRole('list', { name: 'Payouts by what happens next' }).waitFor();
    await page.getByTestId('budget-fundedMinor').waitFor();
    const fundedBefore = dollars(await page.getByTestId('budget-fundedMinor').textContent());
    // One source for every total: the cards are the sums of the queue's groups.
    const card = async (key: string) => cents(dollars(await page.getByTestId(`budget-${key}`).textContent()));
    await expect
      .poll(
        async () =>
          (await card('owedMinor')) ===
          cents(
            (await groupTotals(page, 'Waiting for approval')).amount +
              (await groupTotals(page, 'Waiting for the participant’s set-up')).amount,
          ),
      )
      .toBe(true);
    expect(await card('needsAttentionMinor')).toBe(cents((await groupTotals(page, 'Needs attention')).amount));
    expect(await card('paidMinor')).toBe(cents((await groupTotals(page, 'Paid')).amount));
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshotAtBothWidths(page, journey, 'pay-page');

    // Fund by card: the stand-in's card fields are plain inputs inside the card element.
    await page.getByRole('button', { name: 'Add funds by card' }).click();
    await page.getByText('Add funds by card', { exact: true }).last().waitFor();
    await page.getByLabel('Amount (USD)').fill('1000');
    await page.getByRole('button', { name: 'Continue to card' }).click();
    await page.getByLabel('Card number').waitFor();
    await page.getByLabel('Card number').pressSequentially('4242 4242 4242 4242');
    await page.getByLabel('Expiry date (MM/YY)').pressSequentially('12/34');
    await page.getByLabel('Security code (CVC)').pressSequentially('123');
    await page.getByLabel('Postal code').pressSequentially('12345');
    await screenshot(page, journey, 'card-entered');
    await page.getByRole('button', { name: 'Pay $1,000.00' }).click();
    await page.getByText("$1,000.00 was added to the study's balance.").waitFor({ timeout: 30_000 });
    await expect
      .poll(async () => dollars(await page.getByTestId('budget-fundedMinor').textContent()), { timeout: 15_000 })
      .toBeGreaterThanOrEqual(fundedBefore + 1000);
    await screenshot(page, journey, 'budget-funded');

    // Approve everything waiting (a second run of this journey finds nothing waiting and sends a failed payout again instead).
    const waiting = await groupTotals(page, 'Waiting for approval');
    const settingUp = await groupTotals(page, 'Waiting for the participant’s set-up');
    let batchSize: number;
    if (waiting.payouts > 0) {
      await page.getByRole('button', { name: `Approve all waiting (${waiting.payouts})` }).click();
      const dialog = page.getByRole('alertdialog');
      await dialog.getByRole('heading', { name: /^Send \$[\d,.]+ now\?$/ }).waitFor();
      expect(await dialog.textContent()).toContain(`${waiting.payouts} payout${waiting.payouts === 1 ? '' : 's'} to`);
      if (settingUp.payouts > 0)
        expect(await dialog.textContent()).toContain(`Not included: ${settingUp.payouts} payout`);
      await screenshotAtBothWidths(page, journey, 'confirm-approve-all');
      await dialog.getByRole('button', { name: /^Send \$/ }).click();
      batchSize = waiting.payouts;
    } else {
      await group(page, 'Needs attention').click();
      await page
        .getByRole('button', { name: /^Retry / })
        .first()
        .click();
      await page.getByRole('alertdialog').getByRole('button', { name: 'Send again' }).click();
      batchSize = 1;
    }
    await page.getByTestId('batch-progress').waitFor({ timeout: 30_000 });
    await screenshot(page, journey, 'batch-progress');
    const finished = page.getByText(/^Batch finished: \d+ paid, \d+ failed\./);
    await finished.waitFor({ timeout: 90_000 });
    const [, paidInBatch, failedInBatch] = /(\d+) paid, (\d+) failed/.exec((await finished.textContent()) ?? '') ?? [];
    await screenshot(page, journey, 'batch-finished');

    // Each payout of the batch ended paid, or failed with the provider's reason and a retry button.
    expect((await groupTotals(page, 'Sent, on its way')).payouts).toBe(0);
    // Other sessions may use the shared demo study at the same time, so the batch's own tally is what is checked.
    expect(Number(paidInBatch) + Number(failedInBatch)).toBe(batchSize);
    if ((await groupTotals(page, 'Needs attention')).payouts > 0) {
      await group(page, 'Needs attention').click();
      const rows = page.getByRole('table', { name: /^Needs attention: payouts, page 1/ }).locator('tbody tr');
      await expect
        .poll(
          async () => (await rows.count()) > 0 && (await rows.allTextContents()).every((row) => row.includes('Failed')),
        )
        .toBe(true);
      const count = await rows.count();
      for (let index = 0; index < count; index += 1) {
        const row = rows.nth(index);
        expect(await row.getByRole('button', { name: /^Retry / }).count()).toBe(1);
        expect(((await row.getByTestId('failure-reason').textContent()) ?? '').trim()).not.toBe('');
      }
      expect(await page.getByText(/has not finished setting up/).count()).toBeGreaterThan(0);
      await screenshot(page, journey, 'failed-with-reasons');
      // Sending again asks first.
      await rows
        .first()
        .getByRole('button', { name: /^Retry / })
        .click();
      await page
        .getByRole('alertdialog')
        .getByRole('heading', { name: /again\?$/ })
        .waitFor();
      await screenshot(page, journey, 'confirm-send-again');
      await page.getByRole('alertdialog').getByRole('button', { name: 'Cancel' }).click();
    }

    // The paid group: dates, search, order, and one participant's payment history with our receipt numbers.
    await group(page, 'Paid').click();
    const paidTable = page.getByRole('table', { name: /^Paid: payouts, page 1/ });
    await expect
      .poll(
        async () => {
          const texts = await paidTable.locator('tbody tr').allTextContents();
          return texts.length > 0 && texts.every((row) => row.includes('Paid'));
        },
        { timeout: 15_000 },
      )
      .toBe(true);
    const firstReference = (
      (await paidTable
        .locator('tbody tr')
        .first()
        .getByRole('button', { name: /^Payment history of / })
        .textContent()) ?? ''
    ).trim();
    await page.getByRole('searchbox', { name: 'Search' }).fill(firstReference);
    await expect
      .poll(
        async () => {
          const texts = await paidTable.locator('tbody tr').allTextContents();
          return texts.length > 0 && texts.every((row) => row.includes(firstReference));
        },
        { timeout: 15_000 },
      )
      .toBe(true);
    await page.getByRole('combobox', { name: 'Order' }).selectOption({ label: 'Largest amount first' });
    await screenshotAtBothWidths(page, journey, 'paid-searched');
    await paidTable
      .getByRole('button', { name: `Payment history of ${firstReference}` })
      .first()
      .click();
    const history = page.getByRole('dialog', { name: `Payments to ${firstReference}` });
    await history
      .getByText(/^wayfinding-cues-\d{4}$/)
      .first()
      .waitFor();
    await history.getByText(/^tr_/).first().waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshotAtBothWidths(page, journey, 'payment-history');
    await history.getByRole('button', { name: 'Close' }).click();
    await page.getByRole('searchbox', { name: 'Search' }).fill('');

    // The finance office's file for this month, named by the study's slug and the period.
    const exportPanel = page.getByRole('region', { name: 'Payments for the finance office' });
    await exportPanel.getByText(/finance office to decide/).waitFor();
    const [download] = await Promise.all([
      page.waitForEvent('download'),
      exportPanel.getByRole('button', { name: 'Download CSV' }).click(),
    ]);
    expect(download.suggestedFilename()).toMatch(/^wayfinding-cues-payments-\d{4}-\d{2}-01-to-\d{4}-\d{2}-\d{2}\.csv$/);
    const csv = readFileSync((await download.path())!);
    expect([...csv.subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    expect(csv.subarray(3).toString('utf8').split(/\r?\n/)[0]).toContain('paid_in_period,paid_in_period_minor');
    await screenshotAtBothWidths(page, journey, 'finance-export');

    // Reconcile with the provider.
    await page.getByRole('button', { name: 'Check against the provider' }).click();
    const region = page.getByRole('region', { name: 'Reconciliation' });
    await region.getByText(/^Checked /).waitFor({ timeout: 30_000 });
    const matches = await region.getByText('Every payout matches.').count();
    if (matches === 0) await region.getByRole('table').waitFor();
    await page
      .getByRole('region', { name: 'Tax reporting threshold' })
      .getByText(/finance office/)
      .first()
      .waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'reconciliation');
  });
});
