import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { seriousAccessibilityProblems } from './support/accessibility';
import { adminUrl, openBrowser, screenshot, signIn, type BrowserSession } from './support/browser';

const journey = 'pay';

/** The count shown on a status chip of the payout queue, 0 when the chip is not shown. */
async function chipCount(page: Page, label: string): Promise<number> {
  const chip = page.getByRole('group', { name: 'Show payouts by status' }).getByRole('button', { name: new RegExp(`^${label}\\s*\\d+$`) });
  if ((await chip.count()) === 0) return 0;
  return Number(((await chip.textContent()) ?? '').replace(/\D/g, ''));
}

const dollars = (text: string | null) => Number((text ?? '').replace(/[^0-9.]/g, ''));

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
    await page.getByRole('table', { name: /Payouts, page 1/ }).waitFor();
    await page.getByTestId('budget-fundedMinor').waitFor();
    const fundedBefore = dollars(await page.getByTestId('budget-fundedMinor').textContent());
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'pay-page');

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
    await page.getByText('$1,000.00 was added to the study\'s balance.').waitFor({ timeout: 30_000 });
    await expect.poll(async () => dollars(await page.getByTestId('budget-fundedMinor').textContent()), { timeout: 15_000 }).toBeGreaterThanOrEqual(fundedBefore + 1000);
    await screenshot(page, journey, 'budget-funded');

    // Approve everything owed (a second run of this journey finds nothing owed and retries a failed payout instead).
    const owed = await chipCount(page, 'Owed');
    let batchSize: number;
    if (owed > 0) {
      await page.getByRole('button', { name: `Approve all owed (${owed})` }).click();
      await page.getByText(`Approve all ${owed} owed payouts?`).waitFor();
      await screenshot(page, journey, 'confirm-approve-all');
      await page.getByRole('button', { name: 'Approve and send' }).click();
      batchSize = owed;
    } else {
      await page.getByRole('button', { name: /^Retry / }).first().click();
      batchSize = 1;
    }
    await page.getByTestId('batch-progress').waitFor({ timeout: 30_000 });
    await screenshot(page, journey, 'batch-progress');
    const finished = page.getByText(/^Batch finished: \d+ paid, \d+ failed\./);
    await finished.waitFor({ timeout: 90_000 });
    const [, paidInBatch, failedInBatch] = /(\d+) paid, (\d+) failed/.exec((await finished.textContent()) ?? '') ?? [];
    await screenshot(page, journey, 'batch-finished');

    // Each payout of the batch ended paid, or failed with the provider's reason and a retry button.
    expect(await chipCount(page, 'Approved')).toBe(0);
    expect(await chipCount(page, 'Sending')).toBe(0);
    // Other sessions may use the shared demo study at the same time, so the batch's own tally is what is checked.
    expect(Number(paidInBatch) + Number(failedInBatch)).toBe(batchSize);
    if ((await chipCount(page, 'Failed')) > 0) {
      await page.getByRole('group', { name: 'Show payouts by status' }).getByRole('button', { name: /^Failed\s*\d+$/ }).click();
      await page.getByRole('button', { name: /^Failed\s*\d+$/, pressed: true }).waitFor();
      const rows = page.getByRole('table', { name: /Payouts, page 1/ }).locator('tbody tr');
      await expect.poll(async () => (await rows.allTextContents()).every((row) => row.includes('Failed'))).toBe(true);
      const count = await rows.count();
      expect(count).toBeGreaterThan(0);
      for (let index = 0; index < count; index += 1) {
        const row = rows.nth(index);
        expect(await row.getByRole('button', { name: /^Retry / }).count()).toBe(1);
        expect(((await row.getByTestId('failure-reason').textContent()) ?? '').trim()).not.toBe('');
      }
      expect(await page.getByText(/has not finished setting up/).count()).toBeGreaterThan(0);
      await screenshot(page, journey, 'failed-with-reasons');
    }

    // Reconcile with the provider.
    await page.getByRole('button', { name: 'Check against the provider' }).click();
    const region = page.getByRole('region', { name: 'Reconciliation' });
    await region.getByText(/^Checked /).waitFor({ timeout: 30_000 });
    const matches = await region.getByText('Every payout matches.').count();
    if (matches === 0) await region.getByRole('table').waitFor();
    await page.getByRole('region', { name: 'Tax reporting threshold' }).getByText(/finance office/).first().waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'reconciliation');
  });
});
