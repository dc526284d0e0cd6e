import hypergeometricPmf from '@stdlib/stats-base-dists-hypergeometric-pmf';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fisherExact } from './fisher-exact';

describe('fisherExact', () => {
  it('reproduces the tea-tasting experiment', () => {
    // Source: Fisher (1935), The Design of Experiments, lady tasting tea; Agresti (2007) §2.6:
    // [[3, 1], [1, 3]] → one-sided P = 17/70 = 0.2429, two-sided P = 0.4857 (= 34/70).
    const result = fisherExact([
      [3, 1],
      [1, 3],
    ]);
    expect(result.pValueGreater).toBeCloseTo(17 / 70, 12);
    expect(result.pValueGreater).toBeCloseTo(0.2429, 4);
    expect(result.pValueTwoSided).toBeCloseTo(0.4857, 4);
    expect(result.pValueLess).toBeCloseTo(69 / 70, 12); // 1 − P(X = 4) = 1 − 1/70
  });

  it('agrees with sums of the @stdlib hypergeometric pmf on random 2×2 tables', () => {
    // Source: @stdlib/stats-base-dists-hypergeometric-pmf 0.3.1; the two-sided rule with relative tolerance 1e-7 as in
    // R's stats::fisher.test (relErr <- 1 + 10^(-7), seen in copies of its source on GitHub via the search tool).
    const cell = fc.nat(40);
    fc.assert(
      fc.property(cell, cell, cell, cell, (a, b, c, d) => {
        const population = a + b + c + d;
        const successes = a + c;
        const draws = a + b;
        const lowest = Math.max(0, draws - (b + d));
        const highest = Math.min(draws, successes);
        const pmf = (x: number) => hypergeometricPmf(x, population, successes, draws);
        let less = 0;
        let greater = 0;
        let twoSided = 0;
        for (let x = lowest; x <= highest; x += 1) {
          if (x <= a) less += pmf(x);
          if (x >= a) greater += pmf(x);
          if (pmf(x) <= pmf(a) * (1 + 1e-7)) twoSided += pmf(x);
        }
        const ours = fisherExact([
          [a, b],
          [c, d],
        ]);
        expect(ours.pValueLess).toBeCloseTo(Math.min(1, less), 9);
        expect(ours.pValueGreater).toBeCloseTo(Math.min(1, greater), 9);
        expect(ours.pValueTwoSided).toBeCloseTo(Math.min(1, twoSided), 9);
      }),
      { numRuns: 300 },
    );
  });

  it('keeps every p-value within [0, 1]', () => {
    const cell = fc.nat(200);
    fc.assert(
      fc.property(cell, cell, cell, cell, (a, b, c, d) => {
        const result = fisherExact([
          [a, b],
          [c, d],
        ]);
        return [result.pValueLess, result.pValueGreater, result.pValueTwoSided].every((p) => p >= 0 && p <= 1);
      }),
    );
  });

  it('refuses anything but a 2×2 table of counts', () => {
    expect(() =>
      fisherExact([
        [1, 2, 3],
        [4, 5, 6],
      ]),
    ).toThrow(/table: must be a 2×2 table/);
    expect(() =>
      fisherExact([
        [1, 2],
        [3, Number.NaN],
      ]),
    ).toThrow(/table\[1\]\[1\]: must be a whole number/);
  });
});
