import { AttritionInputError, requireAtMost, requireCount } from './attrition-input-error';
import { requireConditionIds } from './attrition-rates';
import { type Moments, meanAndVariance } from './sufficient-statistics';

/** Among the participants with a known value: how many have the attribute. */
export interface BinaryCount {
  n: number;
  count: number;
}

export type CovariateInput =
  | {
      covariate: string;
      kind: 'continuous';
      byCondition: readonly { conditionId: string; allRandomized: Moments; completers: Moments }[];
    }
  | {
      covariate: string;
      kind: 'binary';
      byCondition: readonly { conditionId: string; allRandomized: BinaryCount; completers: BinaryCount }[];
    };

export interface StandardizedDifference {
  /** Condition minus comparison, in pooled standard deviations; null when either group is too small or the pooled SD is 0. */
  d: number | null;
  /** |d| ≥ 0.1 (Austin 2009); also true when the pooled SD is 0 but the groups differ; null when nothing can be said. */
  imbalanced: boolean | null;
}

export interface CovariateBalanceRow {
  covariate: string;
  kind: 'continuous' | 'binary';
  conditionId: string;
  comparisonConditionId: string;
  allRandomized: StandardizedDifference;
  completers: StandardizedDifference;
}

// Convention: |d| < 0.1 counts as balanced (Austin 2009, Statistics in Medicine 28:3083).
export const BALANCE_THRESHOLD = 0.1;

function judged(difference: number, pooledVariance: number): StandardizedDifference {
  if (pooledVariance === 0) return { d: difference === 0 ? 0 : null, imbalanced: difference !== 0 };
  const d = difference / Math.sqrt(pooledVariance);
  return { d, imbalanced: Math.abs(d) >= BALANCE_THRESHOLD };
}

// Continuous SMD, Austin (2009) Statistics in Medicine 28:3083: d = (m1 − m2) / √((s1² + s2²) / 2).
export function standardizedMeanDifferenceContinuous(
  condition: Moments,
  comparison: Moments,
  field = 'covariate',
): StandardizedDifference {
  const one = meanAndVariance(condition, `${field}.condition`);
  const two = meanAndVariance(comparison, `${field}.comparison`);
  if (one.variance === null || two.variance === null) return { d: null, imbalanced: null };
  return judged((one.mean as number) - (two.mean as number), (one.variance + two.variance) / 2);
}

function requireBinaryCount(count: BinaryCount, field: string): void {
  requireCount(count.n, `${field}.n`);
  requireCount(count.count, `${field}.count`);
  requireAtMost(count.count, count.n, `${field}.count`, 'n');
}

// Binary SMD, Austin (2009) Statistics in Medicine 28:3083: d = (p1 − p2) / √((p1(1 − p1) + p2(1 − p2)) / 2).
export function standardizedMeanDifferenceBinary(
  condition: BinaryCount,
  comparison: BinaryCount,
  field = 'covariate',
): StandardizedDifference {
  requireBinaryCount(condition, `${field}.condition`);
  requireBinaryCount(comparison, `${field}.comparison`);
  if (condition.n === 0 || comparison.n === 0) return { d: null, imbalanced: null };
  const p1 = condition.count / condition.n;
  const p2 = comparison.count / comparison.n;
  return judged(p1 - p2, (p1 * (1 - p1) + p2 * (1 - p2)) / 2);
}

/** Each other condition against the comparison condition (the first when none is picked), among all randomized and among completers. */
export function covariateBalance(inputs: readonly CovariateInput[], comparisonConditionId?: string): CovariateBalanceRow[] {
  return inputs.flatMap((input, index) => {
    const field = `covariates[${index}]`;
    if (typeof input.covariate !== 'string' || input.covariate === '') {
      throw new AttritionInputError(`${field}.covariate`, 'must be a non-empty string');
    }
    if (input.kind !== 'continuous' && input.kind !== 'binary') {
      throw new AttritionInputError(`${field}.kind`, `must be "continuous" or "binary", got ${String((input as { kind: unknown }).kind)}`);
    }
    const ids = input.byCondition.map((entry) => entry.conditionId);
    requireConditionIds(ids, `${field}.byCondition`);
    if (ids.length === 0) return [];
    const comparisonIndex = comparisonConditionId === undefined ? 0 : ids.indexOf(comparisonConditionId);
    if (comparisonIndex < 0) {
      throw new AttritionInputError(`${field}.byCondition`, `has no entry for the comparison condition "${comparisonConditionId}"`);
    }

    return ids.flatMap((conditionId, i): CovariateBalanceRow[] => {
      if (i === comparisonIndex) return [];
      const at = `${field}.byCondition[${i}]`;
      if (input.kind === 'continuous') {
        const condition = input.byCondition[i];
        const comparison = input.byCondition[comparisonIndex];
        return [
          {
            covariate: input.covariate,
            kind: input.kind,
            conditionId,
            comparisonConditionId: ids[comparisonIndex],
            allRandomized: standardizedMeanDifferenceContinuous(condition.allRandomized, comparison.allRandomized, `${at}.allRandomized`),
            completers: standardizedMeanDifferenceContinuous(condition.completers, comparison.completers, `${at}.completers`),
          },
        ];
      }
      const condition = input.byCondition[i];
      const comparison = input.byCondition[comparisonIndex];
      return [
        {
          covariate: input.covariate,
          kind: input.kind,
          conditionId,
          comparisonConditionId: ids[comparisonIndex],
          allRandomized: standardizedMeanDifferenceBinary(condition.allRandomized, comparison.allRandomized, `${at}.allRandomized`),
          completers: standardizedMeanDifferenceBinary(condition.completers, comparison.completers, `${at}.completers`),
        },
      ];
    });
  });
}
