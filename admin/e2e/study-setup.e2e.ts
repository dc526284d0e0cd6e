import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import { adminUrl, openBrowser, screenshot, signIn, type BrowserSession } from './support/browser';

const journey = 'study-setup';

const conditions = [
  { name: 'lantern signs', label: 'Signpost version 1', instructions: 'Follow the lit signs at each corridor end.' },
  { name: 'floor arrows', label: 'Signpost version 2', instructions: 'Follow the arrows painted on the floor.' },
  { name: 'plain corridors', label: 'Signpost version 3', instructions: 'Find your way with what you see around you.' },
];

const steps = [
  { title: 'Session 1: learning the corridors', pay: '8', shown: '$8.00' },
  { title: 'Session 2: finding the rooms', pay: '12.50', shown: '$12.50' },
];

describe('a researcher sets up a between-subjects study', () => {
  let browser: BrowserSession;

  beforeAll(async () => {
    browser = await openBrowser();
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('creates it with three conditions, a pretest stratum, paid steps and stratified blocks, dry-runs 1,000 arrivals, then checks the demo study’s sealed sequence', async () => {
    const { page } = browser;
    const stamp = `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 5)}`;
    const title = `Corridor signs ${stamp}`;

    await page.goto(`${adminUrl}/sign-in`);
    await signIn(page, 'researcher@evenhand.test');
    await page.getByRole('heading', { name: 'Studies', level: 1 }).waitFor();
    await page.getByRole('table', { name: 'Your studies' }).waitFor();
    await screenshot(page, journey, 'studies');

    // New study
    await page.getByRole('link', { name: 'New study' }).first().click();
    await page.getByRole('heading', { name: 'New study', level: 1 }).waitFor();
    await page.getByLabel('Title').fill(title);
    expect(await page.getByLabel('Link name').inputValue()).toBe(`corridor-signs-${stamp}`);
    await page.getByLabel('Protocol reference').fill('HLCL-2027-021');
    await page
      .getByLabel('Summary for participants')
      .fill('Two short online sessions finding rooms in a virtual office building.');
    await page.getByLabel('Lab name').fill('Harbor Lane Cognition Lab');
    await page.getByLabel('Contact e-mail').fill('corridors@harborlane.test');
    await page.getByRole('radio', { name: /Between subjects/ }).click();
    await page.getByLabel('Target number of participants').fill('120');
    await page.getByLabel('Estimated minutes per participant').fill('50');
    await page.getByLabel('Budget').fill('3,000');
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'new-study-form');
    await page.getByRole('button', { name: 'Create study' }).click();

    await page.getByRole('heading', { name: title, level: 1 }).waitFor();
    expect(new URL(page.url()).pathname).toMatch(/^\/studies\/[0-9a-f-]{36}\/setup$/);
    await page.getByText('No conditions yet').waitFor();
    await screenshot(page, journey, 'empty-setup');

    // Three conditions
    for (const [index, condition] of conditions.entries()) {
      await page.locator('#conditions').getByRole('button', { name: 'Add condition' }).click();
      await page.getByText('Add a condition').waitFor();
      const dialog = page.getByRole('dialog');
      await dialog.getByLabel('Internal name').fill(condition.name);
      await dialog.getByLabel('Participant label').fill(condition.label);
      await dialog.getByLabel('Instructions for participants').fill(condition.instructions);
      if (index === 0) await screenshot(page, journey, 'condition-dialog');
      await dialog.getByRole('button', { name: 'Add condition' }).click();
      await page.getByText(`Condition ${String.fromCharCode(65 + index)} was added.`).waitFor();
    }
    const conditionRows = page.getByRole('table', { name: 'Conditions' }).getByRole('row');
    await expect.poll(() => conditionRows.count()).toBe(4);
    await page.getByText('Allocation ratio').waitFor();
    await screenshot(page, journey, 'conditions');

    // A numeric pretest with cut point 50
    await page.getByRole('button', { name: 'Add factors' }).click();
    await page.getByRole('button', { name: 'Add factor' }).click();
    const factors = page.getByRole('form', { name: 'Stratification factors' });
    await factors
      .getByLabel('Question participants answer')
      .fill('On a scale from 0 to 100, how easily do you find your way in new buildings?');
    await factors.getByLabel('Key').fill('wayfinding_pretest');
    await factors.getByLabel('Cut points').fill('50');
    await factors.getByText('<50 / ≥50').waitFor();
    await factors.getByText('A pretest balances the assignment; it never decides it').waitFor();
    expect(await factors.getByText(/never assigns by a pretest cut-off/).isVisible()).toBe(true);
    await screenshot(page, journey, 'pretest-factor');
    await factors.getByRole('button', { name: 'Save factors' }).click();
    await page.getByText('The stratification factors were saved.').waitFor();
    await page.getByRole('list', { name: 'Levels of wayfinding_pretest' }).waitFor();

    // Two steps with pay
    for (const step of steps) {
      await page.locator('#steps').getByRole('button', { name: 'Add step' }).click();
      await page.getByText('Add a step').waitFor();
      const dialog = page.getByRole('dialog');
      await dialog.getByLabel('Step title').fill(step.title);
      await dialog.getByLabel('Pay (USD)').fill(step.pay);
      await dialog.getByRole('button', { name: 'Add step' }).click();
      await page.getByText('The step was added.').waitFor();
      await page.getByRole('row').filter({ hasText: step.title }).getByRole('cell', { name: step.shown }).waitFor();
    }
    await page.getByRole('table', { name: 'Steps and pay, in order' }).getByText('$20.50').waitFor();
    await page.locator('#steps').scrollIntoViewIfNeeded();
    await screenshot(page, journey, 'steps-and-pay');

    // A recorded exception to equal pay is flagged with its reason
    await page.getByRole('button', { name: 'Pay one condition differently in step 2' }).click();
    await page.getByText('Pay differently in step 2').waitFor();
    const override = page.getByRole('dialog');
    await override.getByText(/Unequal pay can make people in one condition more likely to stay or drop out/).waitFor();
    await override.getByRole('button', { name: /^Condition/ }).click();
    await page.getByRole('option', { name: /C · plain corridors/ }).click();
    await override.getByLabel('Pay in this condition (USD)').fill('15');
    await override.getByLabel('Reason').fill('Condition C takes about ten minutes longer in session 2.');
    await screenshot(page, journey, 'pay-override-dialog');
    await override.getByRole('button', { name: 'Record exception' }).click();
    await page.getByText('The pay exception for step 2 was recorded.').waitFor();
    await page
      .getByRole('list', { name: 'Pay exceptions for step 2' })
      .getByText('C · plain corridors: $15.00')
      .waitFor();
    await page
      .locator('#steps')
      .getByText(/Some steps pay differently by condition/)
      .waitFor();

    // An eligibility question with its rule
    await page.getByRole('button', { name: 'Add questions' }).click();
    await page.getByRole('button', { name: 'Add question' }).click();
    const screening = page.getByRole('form', { name: 'Screening questions' });
    await screening.getByLabel('Question', { exact: true }).fill('Are you 18 or older?');
    await screening.getByLabel('Key').fill('adult');
    await screening.getByLabel('Rule in plain words').fill('18 or older');
    await screenshot(page, journey, 'screening-question');
    await screening.getByRole('button', { name: 'Save questions' }).click();
    await page.getByText('The screening questions were saved.').waitFor();
    await page.locator('#screening').getByText('Are you 18 or older?').waitFor();

    // Stratified blocks of 3 and 6
    const scheme = page.getByRole('form', { name: 'Assignment scheme' });
    await scheme.getByRole('radio', { name: /Stratified permuted blocks/ }).click();
    await scheme.getByLabel('Allowed block sizes').fill('3, 4');
    await scheme.getByRole('button', { name: 'Save scheme' }).click();
    await scheme.getByText(/4 is not a multiple of the total weight 3/).waitFor();
    await screenshot(page, journey, 'scheme-block-size-error');
    await scheme.getByLabel('Allowed block sizes').fill('3, 6');
    await scheme.getByRole('button', { name: 'Save scheme' }).click();
    await scheme.getByText('Saved: Stratified permuted blocks.').waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'scheme-saved');

    // Dry run of 1,000 arrivals
    await page.getByRole('navigation', { name: 'Study' }).getByRole('link', { name: 'Assignment' }).click();
    const dryRun = page.getByRole('form', { name: 'Dry run' });
    await dryRun.waitFor();
    expect(await dryRun.getByLabel('Simulated arrivals').inputValue()).toBe('1000');
    expect(await dryRun.getByLabel('Average').inputValue()).toBe('50');
    await page.getByText('Not sealed yet.').waitFor();
    await screenshot(page, journey, 'assignment-draft');
    await dryRun.getByRole('button', { name: 'Run dry run' }).click();
    await page
      .getByRole('heading', { name: /Result: 1,000 simulated arrivals · Stratified permuted blocks/ })
      .waitFor({ timeout: 60_000 });
    const strata = page.getByRole('table', { name: 'Simulated balance per stratum' });
    await strata.waitFor();
    expect(await strata.getByRole('rowheader').allTextContents()).toEqual([
      'wayfinding pretest <50',
      'wayfinding pretest ≥50',
    ]);
    const stratumTotals = await strata
      .getByRole('row')
      .evaluateAll((rows) =>
        rows.slice(1).map((row) => Number(row.querySelectorAll('td')[3]?.textContent?.replace(/,/g, ''))),
      );
    expect(stratumTotals.reduce((sum, total) => sum + total, 0)).toBe(1000);
    await page.getByRole('table', { name: 'Simulated arrivals per condition' }).waitFor();
    // One factor: its levels are the strata, so there is no separate factor-level table.
    await page.getByText('With one stratification factor, its levels are the strata above.').waitFor();
    await page.getByRole('img', { name: /Line chart of the largest imbalance over 1,000 arrivals/ }).waitFor();
    await expect.poll(() => page.locator('.recharts-line').count()).toBeGreaterThanOrEqual(2);
    await page.getByRole('heading', { name: /Result: 1,000/ }).scrollIntoViewIfNeeded();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'dry-run-result');

    // The demo study's sealed sequence and balance
    await page.getByRole('link', { name: '← All studies' }).click();
    await page.getByRole('table', { name: 'Your studies' }).getByRole('link', { name: 'Wayfinding cues' }).click();
    await page.getByRole('heading', { name: 'Wayfinding cues', level: 1 }).waitFor();
    await page.getByRole('navigation', { name: 'Study' }).getByRole('link', { name: 'Assignment' }).click();
    const commitment = page.getByTestId('commitment');
    await commitment.waitFor();
    expect(await commitment.textContent()).toMatch(/^[0-9a-f]{64}$/);
    const fingerprint = (await commitment.textContent()) ?? '';
    expect(
      await page
        .locator('header')
        .getByText(`${fingerprint.slice(0, 8)}…`)
        .count(),
    ).toBeGreaterThan(0);
    const balance = page.getByRole('table', { name: 'Assignments per stratum and condition' });
    await balance.waitFor();
    expect(await balance.getByRole('rowheader').allTextContents()).toEqual([
      'sense of direction <50',
      'sense of direction ≥50',
    ]);
    expect(await balance.getByRole('columnheader').allTextContents()).toEqual(['Stratum', 'A', 'B', 'C', 'Total']);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'demo-assignment');
  });

  it('shows the within-subjects demo study’s set-up as fixed and its balance per order', async () => {
    const { page } = browser;
    await page.goto(`${adminUrl}/studies`);
    await page.getByRole('table', { name: 'Your studies' }).getByRole('link', { name: 'Checkout flows' }).click();
    await page.getByRole('heading', { name: 'Checkout flows', level: 1 }).waitFor();
    await page.waitForURL((url) => url.pathname.endsWith('/setup'));
    await page.getByRole('form', { name: 'Assignment scheme' }).waitFor({ state: 'detached' });
    await page.locator('#scheme').getByText('Williams design').waitFor();
    expect(
      await page
        .locator('#scheme')
        .getByText(/someone has already been assigned/)
        .isVisible(),
    ).toBe(true);
    expect(await page.locator('#conditions').getByRole('button', { name: 'Add condition' }).count()).toBe(0);
    await screenshot(page, journey, 'within-setup-fixed');

    await page.getByRole('navigation', { name: 'Study' }).getByRole('link', { name: 'Assignment' }).click();
    const balance = page.getByRole('table', { name: 'Assignments per stratum and condition' });
    await balance.waitFor();
    const orders = (await balance.getByRole('columnheader').allTextContents()).slice(1, -1);
    // A Williams design for three conditions has 2 × 3 = 6 orders (Williams 1949), each naming every condition once.
    expect(orders).toHaveLength(6);
    for (const order of orders) expect(order.split(' → ').sort()).toEqual(['A', 'B', 'C']);
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'within-assignment');
  });
});
