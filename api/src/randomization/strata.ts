/**
 * Strata from stratification factors, and the stable key that names a participant's stratum.
 *
 * Assigning by a pretest cut-off (everyone scoring above a line gets one condition) is deliberately not
 * offered: people picked for extreme scores drift back toward the average on their own (regression to the
 * mean), and that drift would be mistaken for an effect of the condition. A numeric pretest is used to
 * stratify instead — each score band gets its own balanced sequence — and the admin screen shows
 * PRETEST_CUTOFF_EXPLANATION when a researcher adds one.
 */
import { FieldError, RandomizationError, RandomizationErrorCode } from './randomization-error';
import { StratificationFactor } from './scheme-parameters';

/** Two sentences for the admin screen, shown when a numeric pretest is added. */
export const PRETEST_CUTOFF_EXPLANATION =
  'Evenhand never assigns by a pretest cut-off (everyone above a score to one condition), because people ' +
  'picked for extreme scores tend to score closer to the average next time anyway, and that drift would look ' +
  'like an effect of the condition. The pretest is used to stratify instead: each score band gets its own ' +
  'balanced sequence, so every condition receives a similar mix of low and high scorers.';

/** The stratum key of a scheme without stratification factors. */
export const UNSTRATIFIED_STRATUM_KEY = 'all';

export type CovariateValue = number | string;

/** A participant's answers keyed by covariate id (the factor ids). */
export type Covariates = Readonly<Record<string, CovariateValue | null | undefined>>;

/** A participant's level on each factor, keyed by factor id. */
export type FactorLevels = Record<string, string>;

/** Level labels in order: cut 65 gives "<65" and "≥65"; cuts 40, 65 give "<40", "≥40 <65", "≥65". */
export function factorLevels(factor: StratificationFactor): string[] {
  if (factor.kind === 'categorical') return factor.categories.slice();
  return Array.from({ length: factor.cutPoints.length + 1 }, (_, index) => numericLevel(factor.cutPoints, index));
}

function numericLevel(cuts: readonly number[], index: number): string {
  if (index === 0) return `<${cuts[0]}`;
  if (index === cuts.length) return `≥${cuts[cuts.length - 1]}`;
  return `≥${cuts[index - 1]} <${cuts[index]}`;
}

function levelOrError(factor: StratificationFactor, value: unknown): { level: string } | { error: string } {
  if (value === undefined || value === null || value === '') {
    return { error: `is missing; the stratification factor "${factor.id}" needs a value` };
  }
  if (factor.kind === 'numeric') {
    if (typeof value !== 'number' || !Number.isFinite(value)) {
      return { error: `must be a number for the numeric factor "${factor.id}" (got ${JSON.stringify(value)})` };
    }
    const cuts = factor.cutPoints;
    let index = 0;
    while (index < cuts.length && value >= cuts[index]) index++;
    return { level: numericLevel(cuts, index) };
  }
  if (typeof value !== 'string' || !factor.categories.includes(value)) {
    return {
      error: `${JSON.stringify(value)} is not one of the categories of "${factor.id}": ${factor.categories.join(', ')}`,
    };
  }
  return { level: value };
}

/** The level of one value on one factor; a value at a cut point belongs to the level at or above it. */
export function levelOf(factor: StratificationFactor, value: unknown, field = `covariates.${factor.id}`): string {
  const result = levelOrError(factor, value);
  if ('error' in result) {
    throw new RandomizationError(RandomizationErrorCode.InvalidCovariates, [{ field, message: result.error }]);
  }
  return result.level;
}

/** A participant's level on every factor; every missing or unknown value is reported at once. */
export function participantLevels(factors: readonly StratificationFactor[], covariates: Covariates): FactorLevels {
  const levels: FactorLevels = {};
  const errors: FieldError[] = [];
  for (const factor of factors) {
    const value = Object.hasOwn(covariates, factor.id) ? covariates[factor.id] : undefined;
    const result = levelOrError(factor, value);
    if ('error' in result) errors.push({ field: `covariates.${factor.id}`, message: result.error });
    else levels[factor.id] = result.level;
  }
  if (errors.length > 0) throw new RandomizationError(RandomizationErrorCode.InvalidCovariates, errors);
  return levels;
}

/**
 * The stratum key: `factorId=level` for each factor, ordered by factor id (code-unit order), joined by "|",
 * e.g. `pretest=≥65|site=north`; "all" when there are no factors. Factor ids cannot hold "=" or "|" and
 * categories cannot hold "|", so distinct strata always get distinct keys.
 */
export function stratumKeyFromLevels(factors: readonly StratificationFactor[], levels: FactorLevels): string {
  if (factors.length === 0) return UNSTRATIFIED_STRATUM_KEY;
  let ids = factors.map((f) => f.id);
  if (ids.some((id, i) => i > 0 && compareCodeUnits(ids[i - 1], id) > 0)) ids = ids.sort(compareCodeUnits);
  let key = '';
  for (let i = 0; i < ids.length; i++) key += `${i === 0 ? '' : '|'}${ids[i]}=${levels[ids[i]]}`;
  return key;
}

export function stratumKeyFor(factors: readonly StratificationFactor[], covariates: Covariates): string {
  return stratumKeyFromLevels(factors, participantLevels(factors, covariates));
}

/** Every stratum key of these factors (the product of their levels). */
export function allStratumKeys(factors: readonly StratificationFactor[]): string[] {
  let combinations: FactorLevels[] = [{}];
  for (const factor of factors) {
    const next: FactorLevels[] = [];
    for (const partial of combinations) {
      for (const level of factorLevels(factor)) next.push({ ...partial, [factor.id]: level });
    }
    combinations = next;
  }
  return combinations.map((levels) => stratumKeyFromLevels(factors, levels));
}

export function compareCodeUnits(a: string, b: string): number {
  if (a === b) return 0;
  return a < b ? -1 : 1;
}
