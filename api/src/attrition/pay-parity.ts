import { jStat } from 'jstat';
import { AttritionInputError } from './attrition-input-error';
import { requireConditionIds } from './attrition-rates';
import { type Moments, meanAndVariance } from './sufficient-statistics';

/** Amounts paid in integer minor units of the study's currency, aggregated per condition. */
export interface ConditionPayInput {
  conditionId: string;
  /** Over every randomized participant, unpaid ones counting as 0. */
  perRandomized: Moments;
  /** Over completers only. */
  perCompleter: Moments;
}

export interface PaySummary {
  n: number;
  /** Mean amount in minor units; null when n is 0. */
  mean: number | null;
  standardDeviation: number | null;
}

export type WelchAnovaNotComputable =
  'fewer-than-two-conditions-with-two-or-more-participants' | 'no-variation-within-a-condition';

export interface WelchAnovaResult {
  method: 'welch-anova';
  statistic: number | null;
  df1: number | null;
  df2: number | null;
  pValue: number | null;
  /** Conditions with fewer than two participants have no variance and are left out of the test. */
  conditionIdsTested: string[];
  notComputable: WelchAnovaNotComputable | null;
}

export type MeanDifferenceNotComputable = 'fewer-than-two-in-a-condition' | 'no-variation-in-either-condition';

/** Mean pay of one condition minus the comparison condition's, with its Welch t interval. */
export interface MeanDifference {
  conditionId: string;
  comparisonConditionId: string;
  method: 'welch-t';
  /** Minor units; null when a condition has nobody. */
  difference: number | null;
  confidenceLevel: number;
  lower: number | null;
  upper: number | null;
  /** Welch–Satterthwaite degrees of freedom. */
  df: number | null;
  standardError: number | null;
  notComputable: MeanDifferenceNotComputable | null;
}

export interface PayComparison {
  /** Largest minus smallest condition mean, in minor units; null with fewer than two conditions that have anyone. */
  largestMeanDifference: number | null;
  test: WelchAnovaResult;
  /** Each other condition against the comparison condition. */
  differences: MeanDifference[];
}

// Welch's t interval for a difference in means without assuming equal variances (Welch 1947, Biometrika 34:28):
// x̄1 − x̄2 ± t(ν)·√(s1²/n1 + s2²/n2), ν = (s1²/n1 + s2²/n2)² / ((s1²/n1)²/(n1 − 1) + (s2²/n2)²/(n2 − 1)).
export function welchDifferenceInterval(
  condition: { conditionId: string } & Moments,
  comparison: { conditionId: string } & Moments,
  confidenceLevel = 0.95,
  field = 'groups',
): MeanDifference {
  const one = meanAndVariance(condition, `${field}.condition`);
  const two = meanAndVariance(comparison, `${field}.comparison`);
  const base = {
    conditionId: condition.conditionId,
    comparisonConditionId: comparison.conditionId,
    method: 'welch-t' as const,
    confidenceLevel,
  };
  const difference = one.mean === null || two.mean === null ? null : one.mean - two.mean;
  const empty = (notComputable: MeanDifferenceNotComputable): MeanDifference => ({
    ...base,
    difference,
    lower: null,
    upper: null,
    df: null,
    standardError: null,
    notComputable,
  });
  if (one.variance === null || two.variance === null || difference === null)
    return empty('fewer-than-two-in-a-condition');
  const a = one.variance / one.n;
  const b = two.variance / two.n;
  if (a + b === 0) return empty('no-variation-in-either-condition');
  const df = (a + b) ** 2 / (a ** 2 / (one.n - 1) + b ** 2 / (two.n - 1));
  const standardError = Math.sqrt(a + b);
  const t = jStat.studentt.inv(1 - (1 - confidenceLevel) / 2, df);
  return {
    ...base,
    difference,
    lower: difference - t * standardError,
    upper: difference + t * standardError,
    df,
    standardError,
    notComputable: null,
  };
}

export interface PayParityResult {
  currency: string;
  conditions: { conditionId: string; perRandomized: PaySummary; perCompleter: PaySummary }[];
  perRandomized: PayComparison;
  perCompleter: PayComparison;
  /** Passed through: some condition has its own recorded pay override, so unequal pay may be by design. */
  payOverrideRecorded: boolean;
}

// Why Welch's ANOVA: dropouts are paid less, so pay variance differs by condition exactly when dropout does, and Welch's
// test does not assume equal variances; it needs only n, Σx, Σx² per condition (SQL aggregates), and with the group sizes
// of online studies the means are close to normal despite skewed pay. Kruskal–Wallis would need every payment's rank,
// copes badly with the heavy ties of fixed pay amounts, and tests stochastic ordering rather than equal mean pay.
// Welch (1951), Biometrika 38:330: F = [Σw(x̄ − x̃)²/(k − 1)] / [1 + 2(k − 2)Λ/(k² − 1)], w = n/s², Λ = Σ(1 − w/W)²/(n − 1),
// on k − 1 and (k² − 1)/(3Λ) df.
export function welchAnova(groups: readonly ({ conditionId: string } & Moments)[], field = 'groups'): WelchAnovaResult {
  requireConditionIds(
    groups.map((group) => group.conditionId),
    field,
  );
  const summaries = groups.map((group, index) => ({
    conditionId: group.conditionId,
    ...meanAndVariance(group, `${field}[${index}]`),
  }));
  const tested = summaries.filter((summary) => summary.n >= 2);
  const conditionIdsTested = tested.map((summary) => summary.conditionId);
  const notComputable = (reason: WelchAnovaNotComputable): WelchAnovaResult => ({
    method: 'welch-anova',
    statistic: null,
    df1: null,
    df2: null,
    pValue: null,
    conditionIdsTested,
    notComputable: reason,
  });
  if (tested.length < 2) return notComputable('fewer-than-two-conditions-with-two-or-more-participants');
  if (tested.some((summary) => summary.variance === 0)) return notComputable('no-variation-within-a-condition');

  const k = tested.length;
  const weights = tested.map((summary) => summary.n / (summary.variance as number));
  const totalWeight = weights.reduce((sum, w) => sum + w, 0);
  const weightedMean = tested.reduce((sum, summary, i) => sum + weights[i] * (summary.mean as number), 0) / totalWeight;
  const between =
    tested.reduce((sum, summary, i) => sum + weights[i] * ((summary.mean as number) - weightedMean) ** 2, 0) / (k - 1);
  const lambda = tested.reduce((sum, summary, i) => sum + (1 - weights[i] / totalWeight) ** 2 / (summary.n - 1), 0);
  const statistic = between / (1 + (2 * (k - 2) * lambda) / (k * k - 1));
  const df1 = k - 1;
  const df2 = (k * k - 1) / (3 * lambda);
  // Upper tail of F through the regularised incomplete beta: P(F > f) = I_{df2/(df2 + df1·f)}(df2/2, df1/2).
  const pValue = Math.min(1, Math.max(0, jStat.ibeta(df2 / (df2 + df1 * statistic), df2 / 2, df1 / 2)));
  return { method: 'welch-anova', statistic, df1, df2, pValue, conditionIdsTested, notComputable: null };
}

function summarize(moments: Moments, field: string): PaySummary {
  const { n, mean, variance } = meanAndVariance(moments, field);
  if (moments.sum < 0) throw new AttritionInputError(`${field}.sum`, 'amounts paid cannot be negative');
  return { n, mean, standardDeviation: variance === null ? null : Math.sqrt(variance) };
}

function compare(
  summaries: PaySummary[],
  groups: readonly ({ conditionId: string } & Moments)[],
  field: string,
  comparisonConditionId: string | undefined,
): PayComparison {
  const means = summaries.map((summary) => summary.mean).filter((mean): mean is number => mean !== null);
  const test = welchAnova(groups, field);
  const comparison = groups.find((group) => group.conditionId === comparisonConditionId) ?? groups[0];
  return {
    largestMeanDifference: means.length < 2 ? null : Math.max(...means) - Math.min(...means),
    test,
    differences: comparison
      ? groups
          .filter((group) => group !== comparison)
          .map((group) => welchDifferenceInterval(group, comparison, 0.95, field))
      : [],
  };
}

export interface PayParityInput {
  /** ISO 4217 code of the study's currency, passed through. */
  currency: string;
  payOverrideRecorded: boolean;
  conditions: readonly ConditionPayInput[];
  /** The condition the others' mean pay is compared with; the first condition when absent. */
  comparisonConditionId?: string;
}

export function payParity(input: PayParityInput): PayParityResult {
  if (typeof input.currency !== 'string' || !/^[A-Za-z]{3}$/.test(input.currency)) {
    throw new AttritionInputError(
      'pay.currency',
      `must be an ISO 4217 code such as "EUR", got ${String(input.currency)}`,
    );
  }
  if (typeof input.payOverrideRecorded !== 'boolean')
    throw new AttritionInputError('pay.payOverrideRecorded', 'must be true or false');
  requireConditionIds(
    input.conditions.map((condition) => condition.conditionId),
    'pay.conditions',
  );
  const conditions = input.conditions.map((condition, index) => ({
    conditionId: condition.conditionId,
    perRandomized: summarize(condition.perRandomized, `pay.conditions[${index}].perRandomized`),
    perCompleter: summarize(condition.perCompleter, `pay.conditions[${index}].perCompleter`),
  }));
  return {
    currency: input.currency,
    conditions,
    perRandomized: compare(
      conditions.map((condition) => condition.perRandomized),
      input.conditions.map((condition) => ({ conditionId: condition.conditionId, ...condition.perRandomized })),
      'pay.conditions.perRandomized',
      input.comparisonConditionId,
    ),
    perCompleter: compare(
      conditions.map((condition) => condition.perCompleter),
      input.conditions.map((condition) => ({ conditionId: condition.conditionId, ...condition.perCompleter })),
      'pay.conditions.perCompleter',
      input.comparisonConditionId,
    ),
    payOverrideRecorded: input.payOverrideRecorded,
  };
}
