import chi2test from '@stdlib/stats-chi2test';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { placebo, sixMp } from './freireich-1963.fixture';
import { logRankTest } from './log-rank';
import { cochranMantelHaenszel, stratifiedLogRank } from './stratified-tests';

describe('Cochran–Mantel–Haenszel test of dropout across strata', () => {
  it('with one stratum equals (N − 1)/N times Pearson’s X² (@stdlib/stats-chi2test, no continuity correction)', () => {
    const table = [
      [4, 16],
      [9, 11],
      [12, 8],
    ];
    const result = cochranMantelHaenszel([
      { stratum: 'all', conditions: table.map(([dropped, stayed]) => ({ randomized: dropped + stayed, dropped })) },
    ]);
    const pearson = chi2test(table, { correct: false }).statistic;
    expect(result.df).toBe(2);
    expect(result.statistic as number).toBeCloseTo((pearson * 59) / 60, 10);
  });

  it('on 2×2 tables equals the classic Mantel–Haenszel form Σ(a − E a)² / Σ Var a, by hand', () => {
    // Stratum 1: 3/10 vs 6/10 dropped; stratum 2: 1/8 vs 4/12. E a = n1 m / N; Var a = n1 n2 m (N − m) / (N² (N − 1)).
    const strata = [
      {
        stratum: 'low',
        conditions: [
          { randomized: 10, dropped: 3 },
          { randomized: 10, dropped: 6 },
        ],
      },
      {
        stratum: 'high',
        conditions: [
          { randomized: 8, dropped: 1 },
          { randomized: 12, dropped: 4 },
        ],
      },
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
    const result = cochranMantelHaenszel([
      {
        stratum: 'x',
        conditions: [
          { randomized: 5, dropped: 0 },
          { randomized: 5, dropped: 0 },
        ],
      },
    ]);
    expect(result.statistic).toBeNull();
    expect(result.strataUsed).toBe(0);
  });
});

describe('stratified log-rank test of time to dropout', () => {
  it('with one stratum is the ordinary log-rank test (Freireich 1963: χ² = 16.79, as R survdiff)', () => {
    // Source: Kleinbaum & Klein, Survival Analysis, log-rank χ² = 16.79 on 1 df for these remission data.
    const result = stratifiedLogRank([
      {
        stratum: 'all',
        groups: [
          { conditionId: '6-mp', counts: sixMp },
          { conditionId: 'placebo', counts: placebo },
        ],
      },
    ]);
    expect(result.statistic as number).toBeCloseTo(16.79, 2);
    expect(result.df).toBe(1);
    expect(result.groups[1]).toMatchObject({ conditionId: 'placebo', observed: 21 });
  });

  it('when everyone in a stratum ends follow-up at one time, equals the Cochran–Mantel–Haenszel test (property, fast-check)', () => {
    // With a single risk set per stratum the log-rank O − E and its hypergeometric variance are exactly those of the
    // stratum's r×2 table (Mantel 1966), so the two stratified statistics must agree.
    const arm = fc.record({ dropped: fc.nat(6), stayed: fc.nat(6) });
    const stratum = fc.tuple(arm, arm, arm, fc.integer({ min: 1, max: 30 }));
    fc.assert(
      fc.property(fc.array(stratum, { minLength: 1, maxLength: 4 }), (drawn) => {
        const strata = drawn.map(([a, b, c, time], s) => ({ stratum: `s${s}`, arms: [a, b, c], time }));
        const logRank = stratifiedLogRank(
          strata.map(({ stratum, arms, time }) => ({
            stratum,
            groups: arms.map((x, i) => ({
              conditionId: `c${i}`,
              counts: [{ time, dropped: x.dropped, censored: x.stayed }],
            })),
          })),
        );
        const cmh = cochranMantelHaenszel(
          strata.map(({ stratum, arms }) => ({
            stratum,
            conditions: arms.map((x) => ({ randomized: x.dropped + x.stayed, dropped: x.dropped })),
          })),
        );
        if (logRank.statistic === null || cmh.statistic === null) return true;
        expect(logRank.statistic).toBeCloseTo(cmh.statistic, 8);
        expect(logRank.df).toBe(cmh.df);
        return true;
      }),
      { numRuns: 200, seed: 17 },
    );
  });

  it('adjusts for strata: a difference that is only between strata disappears', () => {
    // Stratum "young" drops out early in both conditions, "old" late; condition b has more young people. Pooled, b
    // looks worse; within each stratum the conditions are identical.
    const young = (n: number) => [{ time: 2, dropped: n, censored: n }];
    const old = (n: number) => [{ time: 20, dropped: n, censored: 3 * n }];
    const strata = [
      {
        stratum: 'age=<30',
        groups: [
          { conditionId: 'a', counts: young(2) },
          { conditionId: 'b', counts: young(8) },
        ],
      },
      {
        stratum: 'age=≥30',
        groups: [
          { conditionId: 'a', counts: old(8) },
          { conditionId: 'b', counts: old(2) },
        ],
      },
    ];
    expect(stratifiedLogRank(strata).statistic).toBeCloseTo(0, 10);
    const pooled = logRankTest([
      { conditionId: 'a', counts: [...young(2), ...old(8)] },
      { conditionId: 'b', counts: [...young(8), ...old(2)] },
    ]);
    expect(pooled.pValue as number).toBeLessThan(0.05);
  });

  it('names the stratum whose conditions do not match', () => {
    expect(() =>
      stratifiedLogRank([
        {
          stratum: 'x',
          groups: [
            { conditionId: 'a', counts: [] },
            { conditionId: 'b', counts: [] },
          ],
        },
        {
          stratum: 'y',
          groups: [
            { conditionId: 'b', counts: [] },
            { conditionId: 'a', counts: [] },
          ],
        },
      ]),
    ).toThrow(/strata\[1\]\.groups/);
  });
});
