import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { SurvivalTimeCount } from './kaplan-meier';
import { placebo, sixMp } from './freireich-1963.fixture';
import { logRankTest } from './log-rank';

describe('logRankTest', () => {
  it('reproduces the log-rank test for 6-MP against placebo', () => {
    // Source: Freireich et al. (1963) data; log-rank χ² = 16.79 on 1 df (Kleinbaum & Klein, Survival Analysis), and
    // R survival::survdiff prints Chisq = 16.8, p = 4e-05, O = 9, E = 19.3 for 6-MP, O = 21, E = 10.7 for placebo (from memory).
    const result = logRankTest([
      { conditionId: '6-mp', counts: sixMp },
      { conditionId: 'placebo', counts: placebo },
    ]);
    expect(result.statistic).toBeCloseTo(16.79, 2);
    expect(result.df).toBe(1);
    expect(result.pValue as number).toBeCloseTo(4.17e-5, 6);
    expect(result.groups[0]).toMatchObject({ conditionId: '6-mp', observed: 9 });
    expect(result.groups[0].expected).toBeCloseTo(19.3, 1);
    expect(result.groups[1].expected).toBeCloseTo(10.7, 1);
  });

  const group = fc.array(fc.record({ time: fc.nat(30), dropped: fc.nat(4), censored: fc.nat(4) }), {
    minLength: 1,
    maxLength: 12,
  });

  it('does not depend on which condition is left out of the variance-covariance form', () => {
    // Property of the quadratic form U′V⁻¹U (Peto & Peto 1972): any k − 1 of the k conditions give the same statistic.
    fc.assert(
      fc.property(group, group, group, (a: SurvivalTimeCount[], b: SurvivalTimeCount[], c: SurvivalTimeCount[]) => {
        const forward = logRankTest([
          { conditionId: 'a', counts: a },
          { conditionId: 'b', counts: b },
          { conditionId: 'c', counts: c },
        ]);
        const rotated = logRankTest([
          { conditionId: 'c', counts: c },
          { conditionId: 'a', counts: a },
          { conditionId: 'b', counts: b },
        ]);
        if (forward.statistic === null || rotated.statistic === null) return forward.statistic === rotated.statistic;
        expect(rotated.statistic).toBeCloseTo(forward.statistic, 6);
        expect(rotated.df).toBe(forward.df);
        return forward.pValue !== null && forward.pValue >= 0 && forward.pValue <= 1;
      }),
    );
  });

  it('finds no difference between identical conditions, and sums observed to expected', () => {
    const result = logRankTest([
      { conditionId: 'x', counts: sixMp },
      { conditionId: 'y', counts: sixMp },
      { conditionId: 'z', counts: sixMp },
    ]);
    expect(result.df).toBe(2);
    expect(result.statistic).toBeCloseTo(0, 12);
    expect(result.pValue).toBeCloseTo(1, 12);
    const total = result.groups.reduce((sum, g) => sum + g.observed - g.expected, 0);
    expect(total).toBeCloseTo(0, 12);
  });

  it('is not computable without dropouts, and leaves out conditions nobody is in', () => {
    const none = logRankTest([
      { conditionId: 'x', counts: [{ time: 5, dropped: 0, censored: 4 }] },
      { conditionId: 'y', counts: [{ time: 5, dropped: 0, censored: 3 }] },
    ]);
    expect(none.statistic).toBeNull();
    expect(none.pValue).toBeNull();
    const withEmpty = logRankTest([
      { conditionId: '6-mp', counts: sixMp },
      { conditionId: 'placebo', counts: placebo },
      { conditionId: 'unused', counts: [] },
    ]);
    expect(withEmpty.df).toBe(1);
    expect(withEmpty.statistic).toBeCloseTo(16.79, 2);
    expect(() => logRankTest([{ conditionId: 'x', counts: [{ time: Number.NaN, dropped: 1, censored: 0 }] }])).toThrow(
      /groups\[0\]\.counts\[0\]\.time: must be a finite number/,
    );
  });
});

describe('log-rank test on few dropouts', () => {
  // Eight people, four per condition; the first condition loses three early and one later, the second nobody:
  // four dropouts in all, so the chi-square approximation is doubtful (every expected count below 5).
  const groups = [
    {
      conditionId: 'a',
      counts: [
        { time: 1.5, dropped: 1, censored: 0 },
        { time: 2.25, dropped: 1, censored: 0 },
        { time: 3, dropped: 1, censored: 0 },
        { time: 6.5, dropped: 1, censored: 0 },
      ],
    },
    {
      conditionId: 'b',
      counts: [
        { time: 4, dropped: 0, censored: 1 },
        { time: 10, dropped: 0, censored: 3 },
      ],
    },
  ];

  /** Brute force: every one of the C(8, 4) = 70 ways to relabel the same eight follow-ups, equally likely under randomization. */
  function exactPermutationP(): number {
    const people = [
      { time: 1.5, dropped: true },
      { time: 2.25, dropped: true },
      { time: 3, dropped: true },
      { time: 6.5, dropped: true },
      { time: 4, dropped: false },
      { time: 10, dropped: false },
      { time: 10, dropped: false },
      { time: 10, dropped: false },
    ];
    const observed = logRankTest(groups).statistic as number;
    let extreme = 0;
    let total = 0;
    for (let mask = 0; mask < 256; mask += 1) {
      if (mask.toString(2).split('1').length - 1 !== 4) continue;
      const tally = (inA: boolean) =>
        people
          .filter((_, i) => Boolean(mask & (1 << i)) === inA)
          .map((p) => ({ time: p.time, dropped: p.dropped ? 1 : 0, censored: p.dropped ? 0 : 1 }));
      const statistic =
        logRankTest([
          { conditionId: 'a', counts: tally(true) },
          { conditionId: 'b', counts: tally(false) },
        ]).statistic ?? 0;
      total += 1;
      if (statistic >= observed - 1e-9) extreme += 1;
    }
    return extreme / total;
  }

  it('flags the few events and adds a seeded permutation p-value with its standard error', () => {
    const result = logRankTest(groups);
    expect(result.fewEvents).toBe(true);
    expect(result.pValue as number).toBeLessThan(0.05); // the asymptotic p
    const permutation = result.permutation!;
    expect(permutation.replicates).toBeGreaterThanOrEqual(2000);
    expect(permutation.standardError).toBeCloseTo(
      Math.sqrt((permutation.pValue * (1 - permutation.pValue)) / permutation.replicates),
      12,
    );
    // Reference: full enumeration of the 70 relabelings (above): 2 of 70 are as extreme, p = 0.0286.
    expect(Math.abs(permutation.pValue - exactPermutationP())).toBeLessThan(4 * permutation.standardError + 1e-3);
    expect(logRankTest(groups).permutation?.pValue).toBe(permutation.pValue); // same seed, same answer
  });

  it('does not flag a test with enough dropouts in every condition', () => {
    const many = logRankTest([
      {
        conditionId: 'a',
        counts: [
          { time: 1, dropped: 20, censored: 0 },
          { time: 5, dropped: 0, censored: 30 },
        ],
      },
      {
        conditionId: 'b',
        counts: [
          { time: 2, dropped: 10, censored: 0 },
          { time: 5, dropped: 0, censored: 40 },
        ],
      },
    ]);
    expect(many.fewEvents).toBe(false);
    expect(many.permutation).toBeNull();
  });
});
