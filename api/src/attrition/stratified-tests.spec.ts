import chi2test from '@stdlib/stats-chi2test';
import { describe, expect, it } from 'vitest';
import { cochranMantelHaenszel } from './stratified-tests';

describe('Cochran–Mantel–Haenszel test of dropout across strata', () => {
  it('with one stratum equals (N − 1)/N times Pearson’s X² (@stdlib/stats-chi2test, no continuity correction)', () => {
    const table = [
      [4, 16],
      [9, 11],
      [12, 8],
    ];
    const result = cochranMantelHaenszel([{ stratum: 'all', conditions: table.map(([dropped, stayed]) => ({ randomized: dropped + stayed, dropped })) }]);
    const pearson = chi2test(table, { correct: false }).statistic;
    expect(result.df).toBe(2);
    expect(result.statistic as number).toBeCloseTo((pearson * 59) / 60, 10);
  });

  it('on 2×2 tables equals the classic Mantel–Haenszel form Σ(a − E a)² / Σ Var a, by hand', () => {
    // Stratum 1: 3/10 vs 6/10 dropped; stratum 2: 1/8 vs 4/12. E a = n1 m / N; Var a = n1 n2 m (N − m) / (N² (N − 1)).
    const strata = [
      { stratum: 'low', conditions: [{ randomized: 10, dropped: 3 }, { randomized: 10, dropped: 6 }] },
      { stratum: 'high', conditions: [{ randomized: 8, dropped: 1 }, { randomized: 12, dropped: 4 }] },
    ];
    const e1 = (10 * 9) / 20;
    const v1 = (10 * 10 * 9 * 11) / (400 * 19);
    const e2 = (8 * 5) / 20;
    const v2 = (8 * 12 * 5 * 15) / (400 * 19);
    const expected = (3 + 1 - e1 - e2) ** 2 / (v1 + v2);
    const result = cochranMantelHaenszel(strata);
    expect(result.statistic as number).toBeCloseTo(expected, 12);
    expect(result.strataUsed).toBe(2);
  });

  it('skips strata without information and is not computable without any', () => {
    const result = cochranMantelHaenszel([{ stratum: 'x', conditions: [{ randomized: 5, dropped: 0 }, { randomized: 5, dropped: 0 }] }]);
    expect(result.statistic).toBeNull();
    expect(result.strataUsed).toBe(0);
  });
});
