// Wording and number formats for the dropout watch. Pure: no framework imports.

/**
 * A p-value as reported in the behavioural sciences: three decimals, and "p < 0.001" below that
 * (APA Publication Manual, 7th ed., section 6.36, from memory). A leading zero is kept for readers outside the field.
 */
export function formatPValue(p: number | null | undefined): string {
  if (p === null || p === undefined || Number.isNaN(p)) return 'p not computable';
  if (p < 0 || p > 1) throw new RangeError(`pValue must be between 0 and 1, got ${p}`);
  if (p < 0.001) return 'p < 0.001';
  // Rounding 0.9996 up would print 1.000; a p-value is never shown as certainty.
  if (p > 0.999) return 'p > 0.999';
  return `p = ${p.toFixed(3)}`;
}

/** A share between 0 and 1 as a percentage with one decimal, e.g. 0.2727 → "27.3%". */
export function formatShare(share: number | null | undefined): string {
  if (share === null || share === undefined || Number.isNaN(share)) return '—';
  return `${(share * 100).toFixed(1)}%`;
}

/** Percentage points, for differences between two rates: 0.0727 → "7.3 points". */
export function formatPoints(share: number | null | undefined): string {
  if (share === null || share === undefined || Number.isNaN(share)) return '—';
  return `${(share * 100).toFixed(1)} points`;
}

export function formatStatistic(value: number | null | undefined, digits = 2): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—';
  return value.toFixed(digits);
}

export type WwcBoundary = 'cautious' | 'optimistic';
export type WwcVerdict = 'low-attrition' | 'high-attrition' | 'outside-published-range' | 'not-computable';

const verdicts: readonly string[] = ['low-attrition', 'high-attrition', 'outside-published-range', 'not-computable'];

export function asWwcVerdict(value: string): WwcVerdict {
  if (!verdicts.includes(value)) throw new Error(`verdict: unknown WWC verdict "${value}"`);
  return value as WwcVerdict;
}

/** The headline of a WWC verdict under one boundary, in plain words. */
export function wwcVerdictSentence(verdict: WwcVerdict, boundary: WwcBoundary): string {
  switch (verdict) {
    case 'low-attrition':
      return `Differential dropout is within the ${boundary} WWC boundary`;
    case 'high-attrition':
      return `Differential dropout is beyond the ${boundary} WWC boundary`;
    case 'outside-published-range':
      return `Overall attrition is outside the range the ${boundary} WWC boundary covers`;
    case 'not-computable':
      return `The ${boundary} WWC boundary cannot be applied yet`;
  }
}

export interface WwcNumbers {
  overallAttritionRate: number | null;
  differentialAttritionRate: number | null;
  overallPercentRow: number | null;
  maxDifferentialPercent: number | null;
}

/** The numbers behind a verdict: what was observed and what the boundary tolerates at that overall rate. */
export function wwcVerdictDetail(verdict: WwcVerdict, numbers: WwcNumbers): string {
  const observed = `overall attrition ${formatShare(numbers.overallAttritionRate)}, differential ${formatPoints(numbers.differentialAttritionRate)}`;
  switch (verdict) {
    case 'low-attrition':
    case 'high-attrition':
      return `${capitalize(observed)}; at ${numbers.overallPercentRow ?? '—'}% overall the boundary tolerates up to ${numbers.maxDifferentialPercent?.toFixed(1) ?? '—'} points.`;
    case 'outside-published-range':
      return `${capitalize(observed)}; the published table stops before this overall rate, so attrition counts as high.`;
    case 'not-computable':
      return 'Nobody in these conditions has finished their participation window yet.';
  }
}

function capitalize(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** One line for the test of dropout by condition, saying which test and that no continuity correction is applied. */
export function dropoutTestSentence(test: {
  method: string;
  statistic: number | null;
  df: number | null;
  pValue: number | null;
  continuityCorrection: false;
}): string {
  if (test.method === 'fisher-exact') {
    return `Fisher's exact test (two-sided, used because some expected counts are below 5): ${formatPValue(test.pValue)}.`;
  }
  if (test.method === 'chi-square') {
    if (test.statistic === null || test.df === null) return 'Chi-square test of dropout by condition: not computable yet (nobody has dropped out, or only one condition has participants).';
    return `Chi-square test of independence, without continuity correction: χ²(${test.df}) = ${formatStatistic(test.statistic)}, ${formatPValue(test.pValue)}.`;
  }
  throw new Error(`dropoutTest.method: unknown test "${test.method}"`);
}

/** Welch's one-way ANOVA in one line, or why it could not be computed, in plain words. */
export function welchTestSentence(
  test: { statistic: number | null; df1: number | null; df2: number | null; pValue: number | null; notComputable: string | null },
  noVariation: string,
): string {
  if (test.notComputable === 'no-variation-within-a-condition') return `Welch's test: not computable (${noVariation}).`;
  if (test.notComputable === 'fewer-than-two-conditions-with-two-or-more-participants') {
    return "Welch's test: not computable (it needs at least two conditions with two or more participants each).";
  }
  if (test.notComputable) return `Welch's test: not computable (${test.notComputable.replace(/-/g, ' ')}).`;
  return `Welch's test: F(${formatStatistic(test.df1, 0)}, ${formatStatistic(test.df2, 1)}) = ${formatStatistic(test.statistic)}, ${formatPValue(test.pValue)}.`;
}
