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

export interface DropoutTestFigures {
  method: string;
  reason?: string;
  smallestExpected?: number | null;
  statistic: number | null;
  df: number | null;
  pValue: number | null;
  continuityCorrection: false;
  chiSquare?: { statistic: number | null; df: number; pValue: number | null } | null;
  exact?: { method: string; pValue: number; replicates: number | null; standardError: number | null } | null;
}

function whySmall(test: DropoutTestFigures): string {
  return test.smallestExpected === null || test.smallestExpected === undefined
    ? 'used because some expected counts are below 5'
    : `used because the smallest expected count, ${test.smallestExpected.toFixed(2)}, is below 5, where the chi-square approximation is unreliable`;
}

function chiSquareAside(test: DropoutTestFigures): string {
  const chi = test.chiSquare;
  if (!chi || chi.statistic === null) return '';
  return ` The chi-square approximation (χ²(${chi.df}) = ${formatStatistic(chi.statistic)}, ${formatPValue(chi.pValue)}) is not relied on.`;
}

/** One line for the test of dropout by condition: which test the screen leans on, and why. */
export function dropoutTestSentence(test: DropoutTestFigures): string {
  if (test.method === 'fisher-exact') {
    return `Fisher's exact test (two-sided, ${whySmall(test)}): ${formatPValue(test.pValue)}.`;
  }
  if (test.method === 'freeman-halton-exact') {
    return `Freeman–Halton exact test (${whySmall(test)}): ${formatPValue(test.pValue)}.${chiSquareAside(test)}`;
  }
  if (test.method === 'monte-carlo-exact') {
    const replicates = test.exact?.replicates ?? 0;
    const error = test.exact?.standardError;
    return (
      `Exact test estimated from ${replicates.toLocaleString('en')} random tables with the same margins (seeded; ${whySmall(test)}): ` +
      `${formatPValue(test.pValue)}${error === null || error === undefined ? '' : ` (standard error ${error.toPrecision(2)})`}.${chiSquareAside(test)}`
    );
  }
  if (test.method === 'chi-square') {
    if (test.statistic === null || test.df === null)
      return 'Chi-square test of dropout by condition: not computable yet (nobody has dropped out, or only one condition has participants).';
    return `Chi-square test of independence, without continuity correction: χ²(${test.df}) = ${formatStatistic(test.statistic)}, ${formatPValue(test.pValue)}.`;
  }
  throw new Error(`dropoutTest.method: unknown test "${test.method}"`);
}

export interface LogRankFigures {
  statistic: number | null;
  df: number;
  pValue: number | null;
  fewEvents: boolean;
  permutation: { pValue: number; replicates: number; standardError: number; seed: string } | null;
  permutationSkipped: string | null;
}

/** The log-rank line; with few dropouts it leans on the permutation p-value and says the asymptotic one is unreliable. */
export function logRankSentence(test: LogRankFigures): string {
  if (test.statistic === null) return 'Log-rank test across conditions: not computable yet.';
  const asymptotic = `χ²(${test.df}) = ${formatStatistic(test.statistic)}, ${formatPValue(test.pValue)}`;
  if (!test.fewEvents) return `Log-rank test across conditions: ${asymptotic}.`;
  if (test.permutation) {
    return (
      `Few dropouts: the log-rank test is judged by a permutation test (${test.permutation.replicates.toLocaleString('en')} seeded relabellings): ` +
      `${formatPValue(test.permutation.pValue)} (standard error ${test.permutation.standardError.toPrecision(2)}). ` +
      `The chi-square approximation gives ${asymptotic}, which is not reliable here.`
    );
  }
  return `Log-rank test across conditions: ${asymptotic} — too few dropouts for the chi-square approximation to be trusted, and too many participants to run the permutation test on every look; read it as a rough guide only.`;
}

/** A 95 % interval of shares as "12.3–25.0%". */
export function formatShareInterval(interval: { lower: number; upper: number } | null | undefined): string {
  if (!interval) return '—';
  return `${(interval.lower * 100).toFixed(1)}–${(interval.upper * 100).toFixed(1)}%`;
}

/** A 95 % interval of a difference of shares in points, e.g. "−2.1 to 14.0 points". */
export function formatPointsInterval(interval: { lower: number; upper: number } | null | undefined): string {
  if (!interval) return '—';
  return `${(interval.lower * 100).toFixed(1)} to ${(interval.upper * 100).toFixed(1)} points`;
}

/** Welch's one-way ANOVA in one line, or why it could not be computed, in plain words. */
export function welchTestSentence(
  test: {
    statistic: number | null;
    df1: number | null;
    df2: number | null;
    pValue: number | null;
    notComputable: string | null;
  },
  noVariation: string,
): string {
  if (test.notComputable === 'no-variation-within-a-condition') return `Welch's test: not computable (${noVariation}).`;
  if (test.notComputable === 'fewer-than-two-conditions-with-two-or-more-participants') {
    return "Welch's test: not computable (it needs at least two conditions with two or more participants each).";
  }
  if (test.notComputable) return `Welch's test: not computable (${test.notComputable.replace(/-/g, ' ')}).`;
  return `Welch's test: F(${formatStatistic(test.df1, 0)}, ${formatStatistic(test.df2, 1)}) = ${formatStatistic(test.statistic)}, ${formatPValue(test.pValue)}.`;
}

export interface ChiSquareFigures {
  statistic: number | null;
  df: number;
  pValue: number | null;
}

/** A randomization stratum key ("age=<30|site=north") in plain words ("age <30, site north"). */
export function stratumLabel(key: string): string {
  return key
    .split('|')
    .map((part) => part.replace('=', ' '))
    .join(', ');
}

/** The two stratified tests, or why there is nothing to stratify by; one sentence each. */
export function stratifiedSentences(stratified: {
  strata: string[];
  stratified: boolean;
  cmh: ChiSquareFigures | null;
  logRank: ChiSquareFigures | null;
}): string[] {
  if (!stratified.stratified) {
    return [
      stratified.strata.length === 0
        ? 'Nobody is randomized yet, so there are no strata to test within.'
        : 'This study has no randomization strata: everyone was randomized in one stratum, so there is nothing to stratify by and the pooled tests above stand as they are.',
    ];
  }
  const line = (name: string, test: ChiSquareFigures | null) =>
    test === null || test.statistic === null
      ? `${name}: not computable yet (no stratum has dropouts in two or more conditions).`
      : `${name}: χ²(${test.df}) = ${formatStatistic(test.statistic)}, ${formatPValue(test.pValue)}.`;
  return [
    line('Cochran–Mantel–Haenszel test of dropout by condition within strata', stratified.cmh),
    line('Stratified log-rank test of time to dropout within strata', stratified.logRank),
  ];
}

const NOT_ESTIMABLE: Record<string, string> = {
  'nobody-randomized': 'nobody is randomized to it',
  'no-dropouts': 'nobody in it has dropped out, so the ratio would be 0',
  'comparison-has-no-dropouts': 'nobody in the comparison condition has dropped out',
  'did-not-converge': 'the model did not converge',
  'infinite-estimate':
    'the estimate runs off without bound (dropouts in one condition all fall where the other has none)',
};

/** One condition's Cox hazard ratio against the comparison, e.g. "B vs A: hazard ratio 2.31 (95% CI 1.10–4.85), p = 0.027". */
export function hazardRatioSentence(
  ratio: {
    hazardRatio: number | null;
    lower: number | null;
    upper: number | null;
    pValue: number | null;
    notEstimable: string | null;
  },
  name: string,
  comparisonName: string,
): string {
  if (ratio.hazardRatio === null || ratio.lower === null || ratio.upper === null) {
    return `${name} vs ${comparisonName}: not estimable (${NOT_ESTIMABLE[ratio.notEstimable ?? ''] ?? 'not enough data'}).`;
  }
  return `${name} vs ${comparisonName}: hazard ratio ${formatStatistic(ratio.hazardRatio)} (95% CI ${formatStatistic(ratio.lower)}–${formatStatistic(ratio.upper)}), Wald ${formatPValue(ratio.pValue)}.`;
}

/** What the planned-length column shows for one condition. */
export function plannedLengthCell(
  planned: { days: number | null; unknown: string | null },
  condition:
    | {
        cumulative: { cumulative: number; lower: number | null; upper: number | null } | null;
        longestFollowUp: number | null;
      }
    | undefined,
): string {
  if (planned.days === null) return '—';
  if (!condition || condition.cumulative === null) {
    return condition?.longestFollowUp === null || condition === undefined
      ? 'nobody yet'
      : `follow-up reaches day ${condition.longestFollowUp.toFixed(1)} so far`;
  }
  const { cumulative, lower, upper } = condition.cumulative;
  return lower === null || upper === null
    ? formatShare(cumulative)
    : `${formatShare(cumulative)} (95% CI ${formatShareInterval({ lower, upper })})`;
}

/** Why no planned length is known, in plain words. */
export function plannedLengthExplanation(planned: { days: number | null; unknown: string | null }): string {
  if (planned.days !== null) {
    return `Cumulative dropout by day ${planned.days}, the planned study length (the last due day when every step is done on its due day), read off the Kaplan–Meier curve with its 95% log-log band.`;
  }
  return planned.unknown === 'a-step-has-no-due-date'
    ? 'No planned study length: some step has no due date, so the schedule sets no end.'
    : 'No planned study length: the study has no steps yet.';
}
