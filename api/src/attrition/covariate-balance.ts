import { jStat } from 'jstat';
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
  /**
   * The |d| that re-randomizing the same people would exceed only 5 % of the time (the permutation distribution of
   * the difference, normal approximation); null when nothing can be said.
   */
  chanceRange: number | null;
  /** |d| beyond chanceRange (or the groups differ when neither has spread); null when nothing can be said. */
  imbalanced: boolean | null;
  /** Continuous covariates: s²(condition) / s²(comparison), with the 95 % range under equal variances (F distribution). */
  varianceRatio?: number | null;
  varianceRatioRange?: [number, number] | null;
  varianceRatioImbalanced?: boolean | null;
}

export interface CovariateBalanceRow {
  covariate: string;
  kind: 'continuous' | 'binary';
  conditionId: string;
  comparisonConditionId: string;
  allRandomized: StandardizedDifference;
  completers: StandardizedDifference;
}

/** The conventional |d| ≥ 0.1 (Austin 2009) is shown for context only: at small n chance alone exceeds it most of the time. */
export const CONVENTIONAL_BALANCE_THRESHOLD = 0.1;
/** Share of re-randomizations allowed beyond the chance range. */
export const CHANCE_LEVEL = 0.05;

const NOTHING: StandardizedDifference = { d: null, chanceRange: null, imbalanced: null };

/**
 * Judges a difference against what randomization alone produces with these people. Under re-randomization of the
 * same N people into groups of n1 and n2, the difference in means has variance S²(1/n1 + 1/n2), S² the variance of
 * all N (sampling without replacement; Cochran 1977, Sampling Techniques, §2.6); for a share, S² = p̄(1 − p̄)·N/(N − 1).
 * The chance range is z(0.975) times its square root, expressed in the same pooled SD as d.
 */
function judged(difference: number, pooledVariance: number, permutationVariance: number): StandardizedDifference {
  const z = jStat.normal.inv(1 - CHANCE_LEVEL / 2, 0, 1);
  const allowed = z * Math.sqrt(permutationVariance);
  if (pooledVariance === 0) {
    return {
      d: difference === 0 ? 0 : null,
      chanceRange: difference === 0 ? 0 : null,
      imbalanced: Math.abs(difference) > allowed,
    };
  }
  const spread = Math.sqrt(pooledVariance);
  const d = difference / spread;
  return { d, chanceRange: allowed / spread, imbalanced: Math.abs(difference) > allowed };
}

// Continuous SMD, Austin (2009) Statistics in Medicine 28:3083: d = (m1 − m2) / √((s1² + s2²) / 2).
export function standardizedMeanDifferenceContinuous(
  condition: Moments,
  comparison: Moments,
  field = 'covariate',
): StandardizedDifference {
  const one = meanAndVariance(condition, `${field}.condition`);
  const two = meanAndVariance(comparison, `${field}.comparison`);
  if (one.variance === null || two.variance === null) return NOTHING;
  const combined = meanAndVariance(
    {
      n: condition.n + comparison.n,
      sum: condition.sum + comparison.sum,
      sumOfSquares: condition.sumOfSquares + comparison.sumOfSquares,
    },
    field,
  );
  const permutationVariance = (combined.variance as number) * (1 / condition.n + 1 / comparison.n);
  const result = judged(
    (one.mean as number) - (two.mean as number),
    (one.variance + two.variance) / 2,
    permutationVariance,
  );
  if (two.variance === 0)
    return { ...result, varianceRatio: null, varianceRatioRange: null, varianceRatioImbalanced: null };
  // Variance ratio against F(n1 − 1, n2 − 1), its distribution when both groups are normal with equal variances.
  const varianceRatio = one.variance / two.variance;
  const range: [number, number] = [
    jStat.centralF.inv(CHANCE_LEVEL / 2, condition.n - 1, comparison.n - 1),
    jStat.centralF.inv(1 - CHANCE_LEVEL / 2, condition.n - 1, comparison.n - 1),
  ];
  return {
    ...result,
    varianceRatio,
    varianceRatioRange: range,
    varianceRatioImbalanced: varianceRatio < range[0] || varianceRatio > range[1],
  };
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
  if (condition.n === 0 || comparison.n === 0) return NOTHING;
  const p1 = condition.count / condition.n;
  const p2 = comparison.count / comparison.n;
  const total = condition.n + comparison.n;
  const pooled = (condition.count + comparison.count) / total;
  const permutationVariance =
    total < 2 ? 0 : ((pooled * (1 - pooled) * total) / (total - 1)) * (1 / condition.n + 1 / comparison.n);
  return judged(p1 - p2, (p1 * (1 - p1) + p2 * (1 - p2)) / 2, permutationVariance);
}

/** Each other condition against the comparison condition (the first when none is picked), among all randomized and among completers. */
export function covariateBalance(
  inputs: readonly CovariateInput[],
  comparisonConditionId?: string,
): CovariateBalanceRow[] {
  return inputs.flatMap((input, index) => {
    const field = `covariates[${index}]`;
    if (typeof input.covariate !== 'string' || input.covariate === '') {
      throw new AttritionInputError(`${field}.covariate`, 'must be a non-empty string');
    }
    if (input.kind !== 'continuous' && input.kind !== 'binary') {
      throw new AttritionInputError(
        `${field}.kind`,
        `must be "continuous" or "binary", got ${String((input as { kind: unknown }).kind)}`,
      );
    }
    const ids = input.byCondition.map((entry) => entry.conditionId);
    requireConditionIds(ids, `${field}.byCondition`);
    if (ids.length === 0) return [];
    const comparisonIndex = comparisonConditionId === undefined ? 0 : ids.indexOf(comparisonConditionId);
    if (comparisonIndex < 0) {
      throw new AttritionInputError(
        `${field}.byCondition`,
        `has no entry for the comparison condition "${comparisonConditionId}"`,
      );
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
            allRandomized: standardizedMeanDifferenceContinuous(
              condition.allRandomized,
              comparison.allRandomized,
              `${at}.allRandomized`,
            ),
            completers: standardizedMeanDifferenceContinuous(
              condition.completers,
              comparison.completers,
              `${at}.completers`,
            ),
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
          allRandomized: standardizedMeanDifferenceBinary(
            condition.allRandomized,
            comparison.allRandomized,
            `${at}.allRandomized`,
          ),
          completers: standardizedMeanDifferenceBinary(condition.completers, comparison.completers, `${at}.completers`),
        },
      ];
    });
  });
}
