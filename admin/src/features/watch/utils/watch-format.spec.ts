import { describe, expect, it } from 'vitest';
import {
  dropoutTestSentence,
  formatPValue,
  formatShare,
  hazardRatioSentence,
  logRankSentence,
  plannedLengthCell,
  plannedLengthExplanation,
  stratifiedSentences,
  stratumLabel,
  welchTestSentence,
  wwcVerdictDetail,
  wwcVerdictSentence,
} from './watch-format';

describe('formatPValue', () => {
  // APA Publication Manual 7th ed. §6.36 (from memory): exact p to three decimals, "p < .001" below that.
  it('shows tiny values as p < 0.001 instead of scientific notation', () => {
    // Agresti (2007), party identification by gender: X² = 30.070, df = 2, p = 2.954e-7.
    expect(formatPValue(2.954e-7)).toBe('p < 0.001');
    expect(formatPValue(0.00099)).toBe('p < 0.001');
  });

  it('shows other values with three decimals', () => {
    expect(formatPValue(0.001)).toBe('p = 0.001');
    // Fisher's tea-tasting table [[3,1],[1,3]]: two-sided p = 0.4857 (Agresti 2007).
    expect(formatPValue(0.4857)).toBe('p = 0.486');
    expect(formatPValue(0.0818)).toBe('p = 0.082');
  });

  it('never prints p = 1.000', () => {
    expect(formatPValue(0.9999)).toBe('p > 0.999');
    expect(formatPValue(1)).toBe('p > 0.999');
  });

  it('says when there is no p-value, and refuses impossible ones', () => {
    expect(formatPValue(null)).toBe('p not computable');
    expect(() => formatPValue(1.2)).toThrow(/pValue must be between 0 and 1/);
  });
});

describe('WWC verdict wording', () => {
  // WWC Procedures and Standards Handbook v5.0, attrition boundary table (shipped in api/src/attrition/data):
  // at 24% overall attrition the cautious boundary tolerates 4.9 points, the optimistic 9.5.
  const row24 = { overallAttritionRate: 0.238, differentialAttritionRate: 0.0727, overallPercentRow: 24 };

  it('says within and beyond, naming the boundary', () => {
    expect(wwcVerdictSentence('low-attrition', 'optimistic')).toBe(
      'Differential dropout is within the optimistic WWC boundary',
    );
    expect(wwcVerdictSentence('high-attrition', 'cautious')).toBe(
      'Differential dropout is beyond the cautious WWC boundary',
    );
  });

  it('gives the numbers behind the verdict', () => {
    expect(wwcVerdictDetail('high-attrition', { ...row24, maxDifferentialPercent: 4.9 })).toBe(
      'Overall attrition 23.8%, differential 7.3 points; at 24% overall the boundary tolerates up to 4.9 points.',
    );
  });

  it('explains an overall rate past the published table', () => {
    // Handbook table, cautious column: the last tolerable row is 57% overall (0.0 points); above it there is no row.
    expect(wwcVerdictSentence('outside-published-range', 'cautious')).toBe(
      'Overall attrition is outside the range the cautious WWC boundary covers',
    );
    expect(
      wwcVerdictDetail('outside-published-range', {
        overallAttritionRate: 0.7,
        differentialAttritionRate: 0.1,
        overallPercentRow: null,
        maxDifferentialPercent: null,
      }),
    ).toMatch(/published table stops before this overall rate/);
  });
});

describe('dropoutTestSentence', () => {
  it('names the chi-square test and the missing continuity correction', () => {
    // Agresti (2007) party identification by gender: X² = 30.070 on 2 df, p = 2.954e-7.
    expect(
      dropoutTestSentence({
        method: 'chi-square',
        statistic: 30.07,
        df: 2,
        pValue: 2.954e-7,
        continuityCorrection: false,
      }),
    ).toBe('Chi-square test of independence, without continuity correction: χ²(2) = 30.07, p < 0.001.');
  });

  it("names Fisher's exact test when it is used", () => {
    // Tea-tasting table: two-sided p = 0.4857.
    expect(
      dropoutTestSentence({
        method: 'fisher-exact',
        statistic: null,
        df: null,
        pValue: 0.4857,
        continuityCorrection: false,
      }),
    ).toMatch(/^Fisher's exact test .*p = 0\.486\.$/);
  });

  it('leans on the exact r×2 test when expected counts are small with three conditions, and says why', () => {
    // The 3 × 14 table with 2 / 4 / 8 dropped (api dropout-test.spec.ts): expected 4.67, X² = 6.00, chi-square p = 0.0498.
    const sentence = dropoutTestSentence({
      method: 'freeman-halton-exact',
      reason: 'small-expected-counts',
      smallestExpected: 14 / 3,
      statistic: null,
      df: null,
      pValue: 0.0711,
      continuityCorrection: false,
      chiSquare: { statistic: 6, df: 2, pValue: 0.0498 },
      exact: { method: 'freeman-halton-exact', pValue: 0.0711, replicates: null, standardError: null },
    });
    expect(sentence).toMatch(
      /^Freeman–Halton exact test \(used because the smallest expected count, 4\.67, is below 5/,
    );
    expect(sentence).toMatch(/p = 0\.071\./);
    expect(sentence).toMatch(/chi-square approximation \(χ²\(2\) = 6\.00, p = 0\.050\) is not relied on/);
  });

  it('gives the Monte Carlo estimate with its standard error', () => {
    const sentence = dropoutTestSentence({
      method: 'monte-carlo-exact',
      reason: 'small-expected-counts',
      smallestExpected: 2.5,
      statistic: null,
      df: null,
      pValue: 0.0312,
      continuityCorrection: false,
      chiSquare: { statistic: 9, df: 4, pValue: 0.061 },
      exact: { method: 'monte-carlo-exact', pValue: 0.0312, replicates: 20000, standardError: 0.0012 },
    });
    expect(sentence).toMatch(/20,000 random tables/);
    expect(sentence).toMatch(/p = 0\.031 \(standard error 0\.0012\)/);
  });
});

describe('logRankSentence', () => {
  it('warns when dropouts are few and leans on the permutation p-value', () => {
    const sentence = logRankSentence({
      statistic: 4.4,
      df: 1,
      pValue: 0.036,
      fewEvents: true,
      permutation: { pValue: 0.093, replicates: 2000, standardError: 0.0065, seed: 's' },
      permutationSkipped: null,
    });
    expect(sentence).toMatch(/Few dropouts/);
    expect(sentence).toMatch(/permutation test \(2,000 seeded relabellings\): p = 0\.093 \(standard error 0\.0065\)/);
    expect(sentence).toMatch(/χ²\(1\) = 4\.40, p = 0\.036, which is not reliable here/);
  });

  it('says when there were too many people to relabel', () => {
    expect(
      logRankSentence({
        statistic: 4.4,
        df: 1,
        pValue: 0.036,
        fewEvents: true,
        permutation: null,
        permutationSkipped: 'too-many-participants',
      }),
    ).toMatch(/too few dropouts for the chi-square approximation/);
  });

  it('reads as before with enough dropouts', () => {
    expect(
      logRankSentence({
        statistic: 12.34,
        df: 2,
        pValue: 0.0021,
        fewEvents: false,
        permutation: null,
        permutationSkipped: null,
      }),
    ).toBe('Log-rank test across conditions: χ²(2) = 12.34, p = 0.002.');
  });
});

describe('formatShare', () => {
  it('rounds to one decimal of a percent', () => {
    expect(formatShare(3 / 11)).toBe('27.3%');
    expect(formatShare(null)).toBe('—');
  });
});

describe('welchTestSentence', () => {
  const base = { statistic: null, df1: null, df2: null, pValue: null };
  it('says in words why the test could not be computed', () => {
    expect(
      welchTestSentence(
        { ...base, notComputable: 'no-variation-within-a-condition' },
        'everyone in a condition had the same number of contacts',
      ),
    ).toBe("Welch's test: not computable (everyone in a condition had the same number of contacts).");
    expect(
      welchTestSentence({ ...base, notComputable: 'fewer-than-two-conditions-with-two-or-more-participants' }, 'x'),
    ).toMatch(/at least two conditions with two or more/);
  });

  it('reports F with its degrees of freedom and the p-value', () => {
    expect(welchTestSentence({ statistic: 3.456, df1: 2, df2: 57.83, pValue: 0.0384, notComputable: null }, 'x')).toBe(
      "Welch's test: F(2, 57.8) = 3.46, p = 0.038.",
    );
  });
});

describe('stratified tests, hazard ratios and the planned length in words', () => {
  it('says plainly when there are no strata, and names both stratified tests when there are', () => {
    expect(stratifiedSentences({ strata: ['all'], stratified: false, cmh: null, logRank: null })[0]).toMatch(
      /^This study has no randomization strata/,
    );
    const lines = stratifiedSentences({
      strata: ['age=<30', 'age=≥30'],
      stratified: true,
      cmh: { statistic: 4.123, df: 2, pValue: 0.1272 },
      logRank: { statistic: null, df: 0, pValue: null },
    });
    expect(lines).toEqual([
      'Cochran–Mantel–Haenszel test of dropout by condition within strata: χ²(2) = 4.12, p = 0.127.',
      'Stratified log-rank test of time to dropout within strata: not computable yet (no stratum has dropouts in two or more conditions).',
    ]);
    expect(stratumLabel('age=<30|site=north')).toBe('age <30, site north');
  });

  it('gives the hazard ratio with its interval, or why it cannot be estimated', () => {
    expect(
      hazardRatioSentence(
        { hazardRatio: 2.3149, lower: 1.1, upper: 4.851, pValue: 0.0271, notEstimable: null },
        'B',
        'A',
      ),
    ).toBe('B vs A: hazard ratio 2.31 (95% CI 1.10–4.85), Wald p = 0.027.');
    expect(
      hazardRatioSentence(
        { hazardRatio: null, lower: null, upper: null, pValue: null, notEstimable: 'no-dropouts' },
        'C',
        'A',
      ),
    ).toMatch(/not estimable \(nobody in it has dropped out/);
  });

  it('shows cumulative dropout at the planned length, or how far follow-up reaches', () => {
    const planned = { days: 14, unknown: null };
    expect(
      plannedLengthCell(planned, { cumulative: { cumulative: 0.25, lower: 0.1, upper: 0.4 }, longestFollowUp: 20 }),
    ).toBe('25.0% (95% CI 10.0–40.0%)');
    expect(plannedLengthCell(planned, { cumulative: null, longestFollowUp: 9.25 })).toBe(
      'follow-up reaches day 9.3 so far',
    );
    expect(plannedLengthCell({ days: null, unknown: 'no-steps' }, undefined)).toBe('—');
    expect(plannedLengthExplanation({ days: null, unknown: 'a-step-has-no-due-date' })).toMatch(
      /some step has no due date/,
    );
  });
});
