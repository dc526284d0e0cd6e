/**
 * Where a dry run starts: the covariate mix of the people screened so far, or, before anyone is, an even mix. Staff
 * can edit it; it only saves them typing shares and averages they would have to look up.
 *
 * Observed: categories in the shares counted among those who answered; numeric answers as a normal distribution
 * with their mean and sample standard deviation (n − 1), to two decimals. Even: equal shares per category; scores
 * centred on the mean of the cut points, spread over their range (at least 1).
 */
import type { CovariateDistribution } from './dry-run';
import type { Covariates } from './strata';

export interface MixFactor {
  key: string;
  kind: 'numeric' | 'categorical';
  cutPoints: number[] | null;
  categories: string[] | null;
}

export interface StartingMix {
  /** `observed` once anyone screened has answered a factor; `even` before. */
  basis: 'observed' | 'even';
  /** How many screened people answered at least one factor. */
  people: number;
  mix: Record<string, CovariateDistribution>;
}

const twoDecimals = (value: number) => Math.round(value * 100) / 100;

function evenDistribution(factor: MixFactor): CovariateDistribution {
  if (factor.kind === 'categorical')
    return { kind: 'categorical', proportions: Object.fromEntries((factor.categories ?? []).map((c) => [c, 1])) };
  const cuts = factor.cutPoints ?? [];
  const mean = cuts.length > 0 ? cuts.reduce((sum, cut) => sum + cut, 0) / cuts.length : 0;
  const range = cuts.length > 1 ? Math.max(...cuts) - Math.min(...cuts) : Math.abs(mean) * 0.3;
  return { kind: 'normal', mean: twoDecimals(mean), sd: Math.max(1, Math.round(range)) };
}

function numericAnswer(value: unknown): number | null {
  const number = typeof value === 'string' && value.trim() !== '' ? Number(value) : value;
  return typeof number === 'number' && Number.isFinite(number) ? number : null;
}

function observedDistribution(factor: MixFactor, answers: Covariates[]): CovariateDistribution | null {
  if (factor.kind === 'categorical') {
    const categories = factor.categories ?? [];
    const counts = Object.fromEntries(categories.map((category) => [category, 0]));
    let answered = 0;
    for (const record of answers) {
      const value = record[factor.key];
      if (value === null || value === undefined || !Object.hasOwn(counts, String(value))) continue;
      counts[String(value)] += 1;
      answered += 1;
    }
    return answered > 0 ? { kind: 'categorical', proportions: counts } : null;
  }
  const values = answers.map((record) => numericAnswer(record[factor.key])).filter((v): v is number => v !== null);
  if (values.length === 0) return null;
  const mean = values.reduce((sum, value) => sum + value, 0) / values.length;
  const squares = values.reduce((sum, value) => sum + (value - mean) ** 2, 0);
  const sd = values.length > 1 ? Math.sqrt(squares / (values.length - 1)) : 0;
  return { kind: 'normal', mean: twoDecimals(mean), sd: twoDecimals(sd) };
}

const answersAny = (factors: readonly MixFactor[], record: Covariates) =>
  factors.some((factor) => record[factor.key] !== null && record[factor.key] !== undefined);

/** One distribution per factor; a factor nobody has answered yet starts even. */
export function startingCovariateMix(factors: readonly MixFactor[], screened: readonly Covariates[]): StartingMix {
  const answers = screened.filter((record) => answersAny(factors, record));
  const mix: Record<string, CovariateDistribution> = {};
  for (const factor of factors) mix[factor.key] = observedDistribution(factor, answers) ?? evenDistribution(factor);
  return { basis: answers.length > 0 ? 'observed' : 'even', people: answers.length, mix };
}
