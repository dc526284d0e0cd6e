import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seriousAccessibilityProblems } from './support/accessibility';
import {
  adminUrl,
  openBrowser,
  screenshot,
  screenshotAtBothWidths,
  signIn,
  type BrowserSession,
} from './support/browser';

const journey = 'watch';

describe('dropout watch', () => {
  let browser: BrowserSession;

  beforeAll(async () => {
    browser = await openBrowser();
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('the researcher opens the demo study’s dropout watch and sees the flow, the verdict and the curves', async () => {
    const { page } = browser;
    await page.goto(`${adminUrl}/sign-in`);
    await signIn(page, 'researcher@evenhand.test');
    await page.getByRole('heading', { name: 'Studies', level: 1 }).or(page.getByRole('alert')).first().waitFor();
    await page.goto(`${adminUrl}/studies`);
    await page.getByRole('link', { name: 'Wayfinding cues' }).click();
    await page.getByRole('heading', { name: 'Wayfinding cues', level: 1 }).waitFor();

    await page.getByRole('link', { name: 'Dropout watch' }).click();
    await page.waitForURL((url) => url.pathname.endsWith('/watch'));
    await page.getByRole('heading', { name: 'Attrition against the WWC boundaries' }).waitFor();
    await screenshotAtBothWidths(page, journey, 'verdict');
    expect(
      await page.getByText("Statistical flags here are screening aids, not the study's analysis.").isVisible(),
    ).toBe(true);

    // The demo's "no cues" condition (blinded, so a code) loses people faster: beyond the cautious boundary.
    expect(
      await page
        .getByText(/Differential dropout is (within|beyond) the cautious WWC boundary/)
        .first()
        .textContent(),
    ).toMatch(/beyond/);
    expect(
      await page
        .getByText(/the optimistic WWC boundary/)
        .first()
        .isVisible(),
    ).toBe(true);
    // Every pair of the three conditions is judged; the headline names the worst one.
    await expect.poll(() => page.getByRole('list', { name: 'Every pair' }).getByRole('listitem').count()).toBe(3);
    expect(await page.getByTestId('worst-pair-cautious').textContent()).toMatch(/^[A-C] vs [A-C]: /);
    expect(await page.getByText(/judged on the stricter of the two/).isVisible()).toBe(true);
    // The test shown names itself and, with small expected counts, is the exact one.
    const dropoutTest = (await page.getByTestId('dropout-test').textContent()) ?? '';
    expect(dropoutTest).toMatch(
      /^(Chi-square test of independence, without continuity correction|Freeman–Halton exact test \(used because the smallest expected count|Exact test estimated from)/,
    );

    // The flow: drawn, with the same counts as a list for screen readers.
    const flow = page.getByRole('region', { name: 'Participant flow' });
    await flow.scrollIntoViewIfNeeded();
    await expect
      .poll(() => flow.locator('svg text', { hasText: /Assessed for eligibility \(n = \d+\)/ }).count())
      .toBe(1);
    await expect.poll(() => flow.locator('svg text', { hasText: /^Allocated to [A-C] / }).count()).toBe(3);
    expect(await flow.getByRole('list', { name: 'Participant flow, as text' }).textContent()).toMatch(
      /analysed by intention to treat, of\s+whom \d+ completed/,
    );
    await expect.poll(() => flow.locator('svg text', { hasText: /^Analysed, intention to treat/ }).count()).toBe(3);
    const [svgFile] = await Promise.all([
      page.waitForEvent('download'),
      flow.getByRole('button', { name: 'Download diagram (SVG)' }).click(),
    ]);
    expect(svgFile.suggestedFilename()).toMatch(/^participant-flow-[0-9a-f-]{36}\.svg$/);
    const [pngFile] = await Promise.all([
      page.waitForEvent('download'),
      flow.getByRole('button', { name: 'Download diagram (PNG)' }).click(),
    ]);
    expect(pngFile.suggestedFilename()).toMatch(/\.png$/);
    // The files themselves: a standalone SVG with the counts, and a real PNG drawn on a canvas in the browser.
    const svgText = readFileSync(await svgFile.path()).toString('utf8');
    expect(svgText).toMatch(/^<svg[^>]+xmlns="http:\/\/www\.w3\.org\/2000\/svg"/);
    expect(svgText).toMatch(/>Randomized \(n = \d+\)</);
    expect(svgText.match(/>Analysed, intention to treat</g)).toHaveLength(3);
    expect(svgText).not.toMatch(/var\(--/);
    const png = readFileSync(await pngFile.path());
    expect(png.subarray(0, 8).toString('hex')).toBe('89504e470d0a1a0a');
    expect(png.readUInt32BE(16)).toBeGreaterThan(1000); // width in pixels, drawn at twice the diagram's size
    await screenshotAtBothWidths(page, journey, 'flow');
    const conditions = page.getByRole('region', { name: 'By condition' });
    expect(await conditions.getByText(/People still active/).isVisible()).toBe(true);
    // Cumulative dropout by the planned study length (the demo's steps all have due dates), beside the window-ended rate.
    expect(
      await conditions
        .getByRole('columnheader', { name: /^Cumulative dropout by day \d+ \(Kaplan–Meier\)$/ })
        .isVisible(),
    ).toBe(true);
    await expect.poll(() => conditions.getByTestId('planned-length-cell').count()).toBe(3);
    expect(await page.getByTestId('planned-length').textContent()).toMatch(/the planned study length/);

    // The curves: one step line per condition and the log-rank line.
    const curves = page.getByRole('region', { name: 'Dropout over time' });
    await curves.scrollIntoViewIfNeeded();
    // A condition nobody has left yet draws a flat line, which has no height: wait for it to exist, not to be visible.
    await curves.locator('.recharts-line-curve').nth(2).waitFor({ state: 'attached' });
    await expect.poll(() => curves.locator('.recharts-line-curve').count()).toBe(3);
    expect(await page.getByTestId('log-rank').textContent()).toMatch(
      /Log-rank test across conditions: χ²\(2\) = \d+\.\d\d, p [=<>]|Few dropouts: the log-rank test is judged by a permutation test/,
    );
    expect(await page.getByTestId('median-dropout').textContent()).toMatch(/^Median time to dropout: Condition A /);
    // Cox hazard ratios of B and C against A, with their intervals or why they cannot be estimated, and the ties method.
    const hazards = page.getByTestId('hazard-ratios');
    await expect.poll(() => hazards.getByRole('listitem').count()).toBe(2);
    expect(await hazards.getByRole('listitem').first().textContent()).toMatch(
      /^B vs A: (hazard ratio \d+\.\d\d \(95% CI \d+\.\d\d–\d+\.\d\d\)|not estimable)/,
    );
    expect(await hazards.textContent()).toMatch(/tied dropout times use Efron's method/);
    expect(await page.getByRole('link', { name: 'Download data (CSV)' }).getAttribute('href')).toMatch(
      /\/api\/studies\/[0-9a-f-]{36}\/export\.csv$/,
    );
    await screenshotAtBothWidths(page, journey, 'curves');

    // Within the randomization strata: the strata named, both stratified tests.
    const strata = page.getByRole('region', { name: 'Within randomization strata' });
    await strata.scrollIntoViewIfNeeded();
    expect(
      await strata.getByRole('list', { name: 'Randomization strata' }).getByRole('listitem').count(),
    ).toBeGreaterThan(1);
    const stratified = (await strata.getByTestId('stratified-tests').textContent()) ?? '';
    expect(stratified).toMatch(
      /Cochran–Mantel–Haenszel test of dropout by condition within strata: (χ²\(2\) = \d+\.\d\d|not computable)/,
    );
    expect(stratified).toMatch(
      /Stratified log-rank test of time to dropout within strata: (χ²\(2\) = \d+\.\d\d|not computable)/,
    );
    expect(await strata.getByText(/Screening aids, not the study's analysis/).isVisible()).toBe(true);
    await screenshotAtBothWidths(page, journey, 'strata');

    // Pay: each condition against A with its Welch t interval.
    const pay = page.getByRole('region', { name: 'Pay by condition' });
    await pay.scrollIntoViewIfNeeded();
    expect(
      await pay.getByRole('list', { name: 'Differences per randomized' }).getByRole('listitem').first().textContent(),
    ).toMatch(/^B minus A: .+ \((95% CI .+ Welch t on \d+\.\d df|no interval: .+)\)\.$/);
    await screenshotAtBothWidths(page, journey, 'pay');

    const balance = page.getByRole('region', { name: 'Covariate balance' });
    await balance.scrollIntoViewIfNeeded();
    expect(await balance.getByText(/re-randomizing the same people/).isVisible()).toBe(true);
    expect(await balance.getByRole('columnheader', { name: 'Variance ratio' }).isVisible()).toBe(true);
    await screenshotAtBothWidths(page, journey, 'balance');
    expect(await page.getByTestId('repeated-looks').textContent()).toMatch(
      /Checking repeatedly as data arrive inflates false alarms/,
    );

    // Another comparison condition re-computes the pairs.
    await page.getByRole('button', { name: /Compare the others with/ }).click();
    await page.getByRole('option', { name: 'Condition C' }).click();
    await page.getByRole('list', { name: 'Each pair' }).getByText('A vs C').waitFor();
    expect(await seriousAccessibilityProblems(page)).toEqual([]);
    await screenshot(page, journey, 'compare-with-c');
  });
});
