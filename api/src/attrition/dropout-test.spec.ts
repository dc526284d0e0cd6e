import fc from 'fast-check';
import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import { testDropoutByCondition } from './dropout-test';
import { fisherExact } from './fisher-exact';
import { exactRowsByTwoTest } from './exact-table-test';

/**
 * Brute force, built only on jStat's combination (a general-purpose library): every r×2 table with the observed row
 * totals and the observed dropout total, probability Π C(n_i, x_i) / C(N, m) (the multivariate hypergeometric law of
 * Freeman & Halton 1951), summed over the tables no more likely than the observed one.
 */
function bruteForceExactP(dropped: number[], sizes: number[]): number {
  const total = sizes.reduce((sum, n) => sum + n, 0);
  const m = dropped.reduce((sum, x) => sum + x, 0);
  const probability = (xs: number[]) =>
    xs.reduce((product, x, i) => product * jStat.combination(sizes[i], x), 1) / jStat.combination(total, m);
  const observed = probability(dropped);
  let p = 0;
  const walk = (i: number, xs: number[]) => {
    if (i === sizes.length) {
      if (xs.reduce((sum, x) => sum + x, 0) !== m) return;
      const q = probability(xs);
      if (q <= observed * (1 + 1e-7)) p += q;
      return;
    }
    for (let x = 0; x <= sizes[i]; x += 1) walk(i + 1, [...xs, x]);
  };
  walk(0, []);
  return p;
}

const rowsOf = (dropped: number[], sizes: number[]) =>
  dropped.map((d, i) => ({ dropped: d, notDropped: sizes[i] - d }));

describe('test of dropout by condition with three or more conditions and small expected counts', () => {
  // 3 × 14 randomized, 2 / 4 / 8 dropped: every expected dropout count is 14 · 14 / 42 = 4.67 (< 5), as in the demo study.
  const summary = testDropoutByCondition(rowsOf([2, 4, 8], [14, 14, 14]));

  it('leans on the exact Freeman–Halton test, not on the chi-square approximation', () => {
    expect(summary.chiSquare?.smallExpectedCounts).toBe(true);
    expect(summary.method).toBe('freeman-halton-exact');
    expect(summary.reason).toBe('small-expected-counts');
    expect(summary.smallestExpected).toBeCloseTo(14 / 3, 12);
    // Reference: brute-force enumeration on jStat.combination (above).
    expect(summary.pValue as number).toBeCloseTo(bruteForceExactP([2, 4, 8], [14, 14, 14]), 10);
    // The chi-square p (X² = 6.00 by hand, p = e^−3 = 0.0498 on 2 df) stays available but is not the one shown.
    expect(summary.chiSquare?.statistic as number).toBeCloseTo(6, 12);
    expect(summary.pValue as number).toBeGreaterThan(summary.chiSquare?.pValue as number);
  });

  it('keeps chi-square when every expected count is at least 5', () => {
    const large = testDropoutByCondition(rowsOf([10, 15, 25], [50, 50, 50]));
    expect(large.method).toBe('chi-square');
    expect(large.reason).toBe('expected-counts-adequate');
  });
});

describe('exactRowsByTwoTest', () => {
  it('agrees with brute-force enumeration on every small table (property, fast-check)', () => {
    fc.assert(
      fc.property(
        fc
          .array(fc.integer({ min: 1, max: 7 }), { minLength: 2, maxLength: 4 })
          .chain((sizes) =>
            fc.tuple(fc.constant(sizes), fc.tuple(...sizes.map((n) => fc.integer({ min: 0, max: n })))),
          ),
        ([sizes, dropped]) => {
          const result = exactRowsByTwoTest(rowsOf(dropped, sizes).map((r) => [r.dropped, r.notDropped]));
          expect(result.method).toBe('freeman-halton-exact');
          expect(result.pValue).toBeCloseTo(bruteForceExactP(dropped, sizes), 10);
        },
      ),
      { numRuns: 150, seed: 14 },
    );
  });

  it("equals Fisher's exact test on 2×2 tables (fisher-exact.ts, itself checked against R's fisher.test)", () => {
    const table = [
      [2, 8],
      [6, 4],
    ];
    expect(exactRowsByTwoTest(table).pValue).toBeCloseTo(fisherExact(table).pValueTwoSided, 10);
  });

  it('falls back to a seeded Monte Carlo test with its standard error when there are too many tables to list', () => {
    const table = [
      [1, 3],
      [6, 20],
      [7, 20],
      [12, 20],
    ];
    const result = exactRowsByTwoTest(table, { maxTables: 1000, replicates: 4000, seed: 'spec' });
    expect(result.method).toBe('monte-carlo-exact');
    expect(result.replicates).toBe(4000);
    expect(result.standardError as number).toBeCloseTo(Math.sqrt((result.pValue * (1 - result.pValue)) / 4000), 12);
    // The same seed gives the same p; the full enumeration lies within four standard errors of it.
    expect(exactRowsByTwoTest(table, { maxTables: 1000, replicates: 4000, seed: 'spec' }).pValue).toBe(result.pValue);
    const exact = exactRowsByTwoTest(table);
    expect(exact.method).toBe('freeman-halton-exact');
    expect(Math.abs(exact.pValue - result.pValue)).toBeLessThan(4 * (result.standardError as number) + 1e-3);
  });
});
