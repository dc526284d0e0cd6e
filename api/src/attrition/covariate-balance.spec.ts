import { jStat } from 'jstat';
import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';
import {
  type CovariateInput,
  covariateBalance,
  standardizedMeanDifferenceBinary,
  standardizedMeanDifferenceContinuous,
} from './covariate-balance';

describe('standardized mean differences (Austin 2009, Statistics in Medicine 28:3083)', () => {
  it('continuous form on a hand-computable example', () => {
    // By hand: condition ages 4, 6, 8 → mean 6, s² = (4 + 0 + 4) / 2 = 4; comparison 1, 3, 5, 7, 9 → mean 5,
    // s² = (16 + 4 + 0 + 4 + 16) / 4 = 10; d = (6 − 5) / √((4 + 10) / 2) = 1 / √7 = 0.37796.
    const result = standardizedMeanDifferenceContinuous(
      { n: 3, sum: 18, sumOfSquares: 116 },
      { n: 5, sum: 25, sumOfSquares: 165 },
    );
    expect(result.d).toBeCloseTo(0.37796, 5);
    // Chance range by hand: all eight values 1…9 minus 2 → S² = (281 − 43²/8) / 7 = 7.125; 1.96·√(7.125·(1/3 + 1/5)) / √7
    // = 1.4476: with three and five people a d of 0.38 is well within what re-randomizing them produces.
    expect(result.chanceRange as number).toBeCloseTo(
      (jStat.normal.inv(0.975, 0, 1) * Math.sqrt(((281 - 43 ** 2 / 8) / 7) * (1 / 3 + 1 / 5))) / Math.sqrt(7),
      10,
    );
    expect(result.imbalanced).toBe(false);
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
    expect(standardizedMeanDifferenceBinary({ n: 10, count: 0 }, { n: 10, count: 0 })).toEqual({
      d: 0,
      chanceRange: 0,
      imbalanced: false,
    });
    expect(standardizedMeanDifferenceBinary({ n: 10, count: 0 }, { n: 10, count: 10 })).toEqual({
      d: null,
      chanceRange: null,
      imbalanced: true,
    });
    expect(standardizedMeanDifferenceBinary({ n: 0, count: 0 }, { n: 10, count: 3 })).toEqual({
      d: null,
      chanceRange: null,
      imbalanced: null,
    });
    expect(
      standardizedMeanDifferenceContinuous({ n: 1, sum: 30, sumOfSquares: 900 }, { n: 5, sum: 25, sumOfSquares: 165 }),
    ).toEqual({ d: null, chanceRange: null, imbalanced: null });
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
        {
          conditionId: 'landmarks',
          allRandomized: { n: 5, sum: 25, sumOfSquares: 165 },
          completers: { n: 5, sum: 25, sumOfSquares: 165 },
        },
        {
          conditionId: 'map-only',
          allRandomized: { n: 3, sum: 18, sumOfSquares: 116 },
          completers: { n: 2, sum: 14, sumOfSquares: 100 },
        },
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
    expect(() => covariateBalance(inputs, 'turn-by-turn')).toThrow(
      /covariates\[0\]\.byCondition: has no entry for the comparison condition "turn-by-turn"/,
    );
  });
});

describe('a balance flag scaled to the sample', () => {
  const random = seedrandom('balance-spec');
  // Box–Muller standard normal from the seeded stream.
  const normal = () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
  const momentsOf = (values: number[]) => ({
    n: values.length,
    sum: values.reduce((t, v) => t + v, 0),
    sumOfSquares: values.reduce((t, v) => t + v * v, 0),
  });
  const shuffled = <T>(values: T[]) => {
    const copy = [...values];
    for (let i = copy.length - 1; i > 0; i -= 1) {
      const j = Math.floor(random() * (i + 1));
      [copy[i], copy[j]] = [copy[j], copy[i]];
    }
    return copy;
  };

  it('rarely fires by chance with 15 people per condition (the |d| ≥ 0.1 convention fired about 79 % of the time)', () => {
    let flagged = 0;
    let conventional = 0;
    const draws = 2000;
    for (let i = 0; i < draws; i += 1) {
      const values = Array.from({ length: 30 }, normal);
      const result = standardizedMeanDifferenceContinuous(momentsOf(values.slice(0, 15)), momentsOf(values.slice(15)));
      if (result.imbalanced) flagged += 1;
      if (Math.abs(result.d as number) >= 0.1) conventional += 1;
    }
    expect(conventional / draws).toBeGreaterThan(0.7);
    expect(flagged / draws).toBeLessThan(0.08); // nominal 5 %
  });

  it('gives a chance range that matches re-randomizing the same people (Monte Carlo permutation, continuous and binary)', () => {
    const values = Array.from({ length: 40 }, () => 50 + 10 * normal());
    const result = standardizedMeanDifferenceContinuous(momentsOf(values.slice(0, 18)), momentsOf(values.slice(18)));
    const permuted = Array.from({ length: 4000 }, () => {
      const order = shuffled(values);
      return Math.abs(
        standardizedMeanDifferenceContinuous(momentsOf(order.slice(0, 18)), momentsOf(order.slice(18))).d as number,
      );
    }).sort((x, y) => x - y);
    const percentile95 = permuted[Math.floor(0.95 * permuted.length)];
    expect(Math.abs((result.chanceRange as number) - percentile95) / percentile95).toBeLessThan(0.12);

    const people = [...Array(9).fill(1), ...Array(21).fill(0)];
    const count = (xs: number[]) => xs.reduce((t, v) => t + v, 0);
    const binary = standardizedMeanDifferenceBinary({ n: 15, count: 5 }, { n: 15, count: 4 });
    const permutedBinary = Array.from({ length: 4000 }, () => {
      const order = shuffled(people);
      const d = standardizedMeanDifferenceBinary(
        { n: 15, count: count(order.slice(0, 15)) },
        { n: 15, count: count(order.slice(15)) },
      ).d;
      return d === null ? Infinity : Math.abs(d);
    }).sort((x, y) => x - y);
    // The binary |d| takes few values, so compare with the permutation's 95th percentile loosely.
    expect(binary.chanceRange as number).toBeGreaterThan(
      permutedBinary[Math.floor(0.9 * permutedBinary.length)] * 0.85,
    );
    expect(binary.chanceRange as number).toBeLessThan(permutedBinary[Math.floor(0.99 * permutedBinary.length)] * 1.15);
  });

  it('adds the variance ratio with its range under equal variances from the F distribution (jStat.centralF)', () => {
    // By hand: s² 4 (n 3) and 10 (n 5) → ratio 0.4; range F(2, 4) 2.5 % and 97.5 % points from jStat.
    const result = standardizedMeanDifferenceContinuous(
      { n: 3, sum: 18, sumOfSquares: 116 },
      { n: 5, sum: 25, sumOfSquares: 165 },
    );
    expect(result.varianceRatio).toBeCloseTo(0.4, 12);
    expect(result.varianceRatioRange).toEqual([jStat.centralF.inv(0.025, 2, 4), jStat.centralF.inv(0.975, 2, 4)]);
    expect(result.varianceRatioImbalanced).toBe(false);
  });
});
