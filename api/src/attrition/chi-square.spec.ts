import chi2test from '@stdlib/stats-chi2test';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { chiSquareIndependence } from './chi-square';
import { chooseDropoutTest, testDropoutByCondition } from './dropout-test';

describe('chiSquareIndependence', () => {
  it('reproduces Agresti’s party identification by gender example', () => {
    // Source: Agresti, An Introduction to Categorical Data Analysis, 2nd ed. (2007), §2.4, party identification by gender:
    // [[762, 327, 468], [484, 239, 477]] → X² = 30.070, df = 2, P = 2.954e-7.
    const result = chiSquareIndependence([
      [762, 327, 468],
      [484, 239, 477],
    ]);
    expect(result.statistic).toBeCloseTo(30.07, 3);
    expect(result.df).toBe(2);
    expect(result.pValue as number).toBeCloseTo(2.954e-7, 10);
    // Agresti (2007), same table: the expected count of females who are Democrats is 703.7.
    expect(result.expected[0][0]).toBeCloseTo(703.7, 1);
    expect(result.continuityCorrection).toBe(false);
    expect(result.smallExpectedCounts).toBe(false);
  });

  it('agrees with @stdlib/stats-chi2test (no continuity correction) on random r×c tables', () => {
    // Source: @stdlib/stats-chi2test 0.2.1, a general-purpose statistics package; correct: false disables Yates.
    const table = fc
      .record({ rows: fc.integer({ min: 2, max: 5 }), columns: fc.integer({ min: 2, max: 4 }) })
      .chain(({ rows, columns }) =>
        fc.array(fc.array(fc.integer({ min: 1, max: 400 }), { minLength: columns, maxLength: columns }), {
          minLength: rows,
          maxLength: rows,
        }),
      );
    fc.assert(
      fc.property(table, (observed) => {
        const ours = chiSquareIndependence(observed);
        const reference = chi2test(observed, { correct: false });
        expect(ours.df).toBe(reference.df);
        expect(ours.statistic as number).toBeCloseTo(reference.statistic, 8);
        expect(ours.pValue as number).toBeCloseTo(reference.pValue, 10);
        observed.forEach((row, i) =>
          row.forEach((_, j) => expect(ours.expected[i][j]).toBeCloseTo(reference.expected.get(i, j), 9)),
        );
      }),
      { numRuns: 200 },
    );
  });

  it('keeps the p-value within [0, 1] for any table, and gives null when a row or column total is zero', () => {
    const table = fc
      .record({ rows: fc.integer({ min: 2, max: 4 }), columns: fc.integer({ min: 2, max: 3 }) })
      .chain(({ rows, columns }) =>
        fc.array(fc.array(fc.nat(50), { minLength: columns, maxLength: columns }), {
          minLength: rows,
          maxLength: rows,
        }),
      );
    fc.assert(
      fc.property(table, (observed) => {
        const { pValue, statistic } = chiSquareIndependence(observed);
        return pValue === null ? statistic === null : pValue >= 0 && pValue <= 1 && (statistic as number) >= 0;
      }),
    );
    const noDropouts = chiSquareIndependence([
      [0, 30],
      [0, 28],
    ]);
    expect(noDropouts.statistic).toBeNull();
    expect(noDropouts.pValue).toBeNull();
  });

  it('refuses tables that are ragged, too small or hold something other than counts', () => {
    expect(() => chiSquareIndependence([[1, 2]])).toThrow(/table: needs at least two rows/);
    expect(() => chiSquareIndependence([[1, 2], [3]])).toThrow(/table\[1\]: has 1 cells, expected 2/);
    expect(() =>
      chiSquareIndependence([
        [1, 2],
        [3, -4],
      ]),
    ).toThrow(/table\[1\]\[1\]: must be a whole number/);
    expect(() =>
      chiSquareIndependence([
        [1, 2],
        [3, 0.5],
      ]),
    ).toThrow(/table\[1\]\[1\]/);
  });
});

describe('choosing the dropout test', () => {
  it('takes an exact test (Fisher 2×2, Freeman–Halton r×2) with an expected count below 5, chi-square otherwise', () => {
    // Rule: Cochran (1954), common practice.
    expect(
      chooseDropoutTest([
        [3, 1],
        [1, 3],
      ]),
    ).toBe('fisher-exact');
    expect(
      chooseDropoutTest([
        [4, 46],
        [12, 38],
      ]),
    ).toBe('chi-square'); // expected dropouts 8 and 8
    expect(
      chooseDropoutTest([
        [1, 20],
        [2, 20],
        [3, 20],
      ]),
    ).toBe('freeman-halton-exact'); // expected dropouts 2: three conditions with small counts get the exact r×2 test
  });

  it('reports the chosen method’s numbers and always says there is no continuity correction', () => {
    const small = testDropoutByCondition([
      { dropped: 3, notDropped: 1 },
      { dropped: 1, notDropped: 3 },
    ]);
    expect(small.method).toBe('fisher-exact');
    expect(small.pValue).toBeCloseTo(34 / 70, 12); // tea-tasting two-sided p (Fisher 1935; see fisher-exact.spec.ts)
    expect(small.statistic).toBeNull();
    expect(small.continuityCorrection).toBe(false);

    const large = testDropoutByCondition([
      { dropped: 762, notDropped: 795 },
      { dropped: 484, notDropped: 716 },
    ]);
    expect(large.method).toBe('chi-square');
    expect(large.df).toBe(1);
    expect(large.statistic).toBe(large.chiSquare?.statistic);
    expect(large.fisherExact?.pValueTwoSided).toBeGreaterThan(0);

    expect(testDropoutByCondition([{ dropped: 1, notDropped: 2 }]).pValue).toBeNull();
  });
});
