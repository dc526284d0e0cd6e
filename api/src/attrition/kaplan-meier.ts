import { jStat } from 'jstat';
import { AttritionInputError, requireCount, requireNonNegative } from './attrition-input-error';

/** Participants whose follow-up ends at one time since assignment: by dropping out, or censored (completed or still active). */
export interface SurvivalTimeCount {
  /** Time since assignment, in the unit the caller chose (e.g. days). */
  time: number;
  dropped: number;
  censored: number;
}

export interface KaplanMeierStep {
  time: number;
  atRisk: number;
  dropped: number;
  censored: number;
  /** Share still in the study (not dropped out) just after this time. */
  survival: number;
  /** Greenwood standard error of `survival`; null once the curve reaches 0. */
  standardError: number | null;
  lower: number | null;
  upper: number | null;
}

export interface KaplanMeierCurve {
  /** Survival is 1 before the first step. */
  steps: KaplanMeierStep[];
  atStart: number;
  confidenceLevel: number;
  /** Pointwise band on the log(−log S) scale (Kalbfleisch & Prentice 1980): stays within [0, 1]. */
  bandForm: 'log-log';
  /** Median time to dropout: the first time the curve is at or below 0.5; null while it stays above. */
  median: number | null;
}

/** Sorted by time, one entry per distinct time, after checking every field. */
export function normalizeSurvivalCounts(counts: readonly SurvivalTimeCount[], field = 'counts'): SurvivalTimeCount[] {
  const byTime = new Map<number, SurvivalTimeCount>();
  counts.forEach((count, index) => {
    const at = `${field}[${index}]`;
    requireNonNegative(count.time, `${at}.time`);
    requireCount(count.dropped, `${at}.dropped`);
    requireCount(count.censored, `${at}.censored`);
    const entry = byTime.get(count.time) ?? { time: count.time, dropped: 0, censored: 0 };
    entry.dropped += count.dropped;
    entry.censored += count.censored;
    byTime.set(count.time, entry);
  });
  return [...byTime.values()].filter((entry) => entry.dropped + entry.censored > 0).sort((x, y) => x.time - y.time);
}

/** Tallies individual follow-up records (time since assignment, dropped out or censored) into counts per time. */
export function tallySurvivalTimes(
  observations: readonly { time: number; dropped: boolean }[],
  field = 'observations',
): SurvivalTimeCount[] {
  return normalizeSurvivalCounts(
    observations.map(({ time, dropped }) => ({ time, dropped: dropped ? 1 : 0, censored: dropped ? 0 : 1 })),
    field,
  );
}

export function requireConfidenceLevel(confidenceLevel: number, field = 'confidenceLevel'): number {
  if (!(confidenceLevel > 0 && confidenceLevel < 1)) {
    throw new AttritionInputError(field, `must be between 0 and 1, got ${String(confidenceLevel)}`);
  }
  return confidenceLevel;
}

// Kaplan–Meier product-limit estimate (Kaplan & Meier 1958) with Greenwood's variance, Var S = S² Σ d / (n (n − d))
// (Greenwood 1926); dropouts at a time count before censorings at that time, the usual convention.
export function kaplanMeier(
  counts: readonly SurvivalTimeCount[],
  options: { confidenceLevel?: number } = {},
  field = 'counts',
): KaplanMeierCurve {
  const confidenceLevel = requireConfidenceLevel(options.confidenceLevel ?? 0.95);
  const z = jStat.normal.inv(1 - (1 - confidenceLevel) / 2, 0, 1);
  const sorted = normalizeSurvivalCounts(counts, field);
  const atStart = sorted.reduce((total, count) => total + count.dropped + count.censored, 0);

  let atRisk = atStart;
  let survival = 1;
  let greenwoodSum = 0;
  const steps = sorted.map((count): KaplanMeierStep => {
    survival *= 1 - count.dropped / atRisk;
    greenwoodSum += count.dropped === atRisk ? Infinity : count.dropped / (atRisk * (atRisk - count.dropped));
    const step = { ...count, atRisk, survival, ...band(survival, greenwoodSum, z) };
    atRisk -= count.dropped + count.censored;
    return step;
  });
  const median = steps.find((step) => step.survival <= 0.5)?.time ?? null;
  return { steps, atStart, confidenceLevel, bandForm: 'log-log', median };
}

// Log-log band (Kalbfleisch & Prentice 1980): S^exp(±z·σ) with σ = √(Greenwood sum) / |log S|.
function band(
  survival: number,
  greenwoodSum: number,
  z: number,
): Pick<KaplanMeierStep, 'standardError' | 'lower' | 'upper'> {
  if (survival === 0 || !Number.isFinite(greenwoodSum)) return { standardError: null, lower: null, upper: null };
  const standardError = survival * Math.sqrt(greenwoodSum);
  // No dropout yet: Greenwood's variance is 0 and the band collapses onto S = 1.
  if (survival === 1) return { standardError, lower: 1, upper: 1 };
  const spread = Math.exp((z * Math.sqrt(greenwoodSum)) / Math.abs(Math.log(survival)));
  return { standardError, lower: survival ** spread, upper: survival ** (1 / spread) };
}
