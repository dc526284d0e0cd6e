import { AttritionInputError, requireCount, requireFinite } from './attrition-input-error';

/** Count, sum and sum of squares of a measure in one group: what SQL can aggregate without returning the rows. */
export interface Moments {
  n: number;
  sum: number;
  sumOfSquares: number;
}

export interface MeanAndVariance {
  n: number;
  mean: number | null;
  /** Sample variance (n − 1 denominator); null below two observations. */
  variance: number | null;
}

export function requireMoments(moments: Moments, field: string): void {
  requireCount(moments.n, `${field}.n`);
  requireFinite(moments.sum, `${field}.sum`);
  requireFinite(moments.sumOfSquares, `${field}.sumOfSquares`);
  if (moments.n === 0 && (moments.sum !== 0 || moments.sumOfSquares !== 0)) {
    throw new AttritionInputError(field, 'sum and sumOfSquares must be 0 when n is 0');
  }
  // Cauchy–Schwarz: n·Σx² ≥ (Σx)², allowing for rounding in the database's sums.
  if (moments.n * moments.sumOfSquares < moments.sum ** 2 * (1 - 1e-9)) {
    throw new AttritionInputError(`${field}.sumOfSquares`, 'is smaller than sum² / n, which no set of values can give');
  }
}

// Sample mean and variance from sufficient statistics: s² = (Σx² − (Σx)²/n) / (n − 1).
export function meanAndVariance(moments: Moments, field = 'moments'): MeanAndVariance {
  requireMoments(moments, field);
  const { n, sum, sumOfSquares } = moments;
  if (n === 0) return { n, mean: null, variance: null };
  const mean = sum / n;
  if (n < 2) return { n, mean, variance: null };
  return { n, mean, variance: Math.max(0, (sumOfSquares - (sum * sum) / n) / (n - 1)) };
}
