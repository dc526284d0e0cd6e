import { describe, expect, it } from 'vitest';
import { type CovariateInput, covariateBalance, standardizedMeanDifferenceBinary, standardizedMeanDifferenceContinuous } from './covariate-balance';

describe('standardized mean differences (Austin 2009, Statistics in Medicine 28:3083)', () => {
  it('continuous form on a hand-computable example', () => {
    // By hand: condition ages 4, 6, 8 → mean 6, s² = (4 + 0 + 4) / 2 = 4; comparison 1, 3, 5, 7, 9 → mean 5,
    // s² = (16 + 4 + 0 + 4 + 16) / 4 = 10; d = (6 − 5) / √((4 + 10) / 2) = 1 / √7 = 0.37796.
    const result = standardizedMeanDifferenceContinuous({ n: 3, sum: 18, sumOfSquares: 116 }, { n: 5, sum: 25, sumOfSquares: 165 });
    expect(result.d).toBeCloseTo(0.37796, 5);
    expect(result.imbalanced).toBe(true);
  });

  it('binary form on a hand-computable example', () => {
    // By hand: p1 = 10/20 = 0.5, p2 = 6/20 = 0.3; d = 0.2 / √((0.25 + 0.21) / 2) = 0.2 / √0.23 = 0.41703.
    expect(standardizedMeanDifferenceBinary({ n: 20, count: 10 }, { n: 20, count: 6 }).d).toBeCloseTo(0.41703, 5);
    // By hand: p1 = 0.50, p2 = 0.48; d = 0.02 / √((0.25 + 0.2496) / 2) = 0.02 / 0.49980 = 0.04002 → balanced (|d| < 0.1).
    const balanced = standardizedMeanDifferenceBinary({ n: 100, count: 50 }, { n: 100, count: 48 });
    expect(balanced.d).toBeCloseTo(0.04002, 5);
    expect(balanced.imbalanced).toBe(false);
    // Negative direction: condition minus comparison.
    expect(standardizedMeanDifferenceBinary({ n: 20, count: 6 }, { n: 20, count: 10 }).d).toBeCloseTo(-0.41703, 5);
  });

  it('handles groups without spread or without people', () => {
    expect(standardizedMeanDifferenceBinary({ n: 10, count: 0 }, { n: 10, count: 0 })).toEqual({ d: 0, imbalanced: false });
    expect(standardizedMeanDifferenceBinary({ n: 10, count: 0 }, { n: 10, count: 10 })).toEqual({ d: null, imbalanced: true });
    expect(standardizedMeanDifferenceBinary({ n: 0, count: 0 }, { n: 10, count: 3 })).toEqual({ d: null, imbalanced: null });
    expect(standardizedMeanDifferenceContinuous({ n: 1, sum: 30, sumOfSquares: 900 }, { n: 5, sum: 25, sumOfSquares: 165 })).toEqual({ d: null, imbalanced: null });
    expect(() => standardizedMeanDifferenceBinary({ n: 5, count: 6 }, { n: 5, count: 1 }, 'covariates[2]')).toThrow(
      /covariates\[2\]\.condition\.count: must not exceed n \(5\), got 6/,
    );
  });
});

describe('covariateBalance', () => {
  const inputs: CovariateInput[] = [
    {
      covariate: 'age',
      kind: 'continuous',
      byCondition: [
        { conditionId: 'landmarks', allRandomized: { n: 5, sum: 25, sumOfSquares: 165 }, completers: { n: 5, sum: 25, sumOfSquares: 165 } },
        { conditionId: 'map-only', allRandomized: { n: 3, sum: 18, sumOfSquares: 116 }, completers: { n: 2, sum: 14, sumOfSquares: 100 } },
      ],
    },
    {
      covariate: 'usesNavigationApp',
      kind: 'binary',
      byCondition: [
        { conditionId: 'landmarks', allRandomized: { n: 100, count: 48 }, completers: { n: 80, count: 40 } },
        { conditionId: 'map-only', allRandomized: { n: 100, count: 50 }, completers: { n: 60, count: 36 } },
      ],
    },
  ];

  it('compares each condition with the comparison among all randomized and among completers', () => {
    const rows = covariateBalance(inputs, 'landmarks');
    expect(rows).toHaveLength(2);
    expect(rows[0]).toMatchObject({ covariate: 'age', conditionId: 'map-only', comparisonConditionId: 'landmarks' });
    expect(rows[0].allRandomized.d).toBeCloseTo(1 / Math.sqrt(7), 12);
    // Completers: 6, 8 → mean 7, s² = 2; comparison mean 5, s² = 10; d = 2 / √6 = 0.8165.
    expect(rows[0].completers.d).toBeCloseTo(2 / Math.sqrt(6), 12);
    // Binary among randomized: 0.50 vs 0.48 → 0.04002 (balanced); completers 0.6 vs 0.5 → 0.1 / √0.245 = 0.2020.
    expect(rows[1].allRandomized).toMatchObject({ imbalanced: false });
    expect(rows[1].completers.d).toBeCloseTo(0.1 / Math.sqrt(0.245), 12);
  });

  it('refuses a comparison condition a covariate has no entry for', () => {
    expect(() => covariateBalance(inputs, 'turn-by-turn')).toThrow(/covariates\[0\]\.byCondition: has no entry for the comparison condition "turn-by-turn"/);
  });
});
