import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { coxProportionalHazards } from './cox-model';
import { placebo, sixMp } from './freireich-1963.fixture';
import type { SurvivalTimeCount } from './kaplan-meier';

const freireich = [
  { conditionId: '6-mp', counts: sixMp },
  { conditionId: 'placebo', counts: placebo },
];

describe('coxProportionalHazards', () => {
  it('reproduces the placebo-vs-6-MP hazard ratio with Efron ties', () => {
    // Source: Freireich et al. (1963) remission data (R MASS::gehan); R survival::coxph(Surv(time, cens) ~ treat), Efron
    // ties (its default), prints coef 1.572, exp(coef) 4.817, se(coef) 0.412, 95 % interval 2.147 to 10.81 (from memory).
    const result = coxProportionalHazards(freireich, '6-mp');
    expect(result).toMatchObject({ method: 'cox-proportional-hazards', ties: 'efron', converged: true });
    const [placeboRatio] = result.hazardRatios;
    expect(placeboRatio.conditionId).toBe('placebo');
    expect(placeboRatio.coefficient as number).toBeCloseTo(1.572, 3);
    expect(placeboRatio.hazardRatio as number).toBeCloseTo(4.817, 2);
    expect(placeboRatio.standardError as number).toBeCloseTo(0.412, 3);
    expect(placeboRatio.lower as number).toBeCloseTo(2.147, 2);
    expect(placeboRatio.upper as number).toBeCloseTo(10.81, 1);
  });

  it('reproduces the Breslow fit of the same data', () => {
    // Source: R survival::coxph(..., ties = "breslow") on the same data: coef 1.509, se 0.410 (from memory; Kleinbaum &
    // Klein, Survival Analysis, ch. 3, print HR 4.52 for the Breslow fit of these remission data).
    const [placeboRatio] = coxProportionalHazards(freireich, '6-mp', { ties: 'breslow' }).hazardRatios;
    expect(placeboRatio.coefficient as number).toBeCloseTo(1.509, 3);
    expect(placeboRatio.hazardRatio as number).toBeCloseTo(4.52, 2);
    expect(placeboRatio.standardError as number).toBeCloseTo(0.41, 2);
  });

  const series = fc.array(fc.record({ time: fc.nat(40), dropped: fc.nat(3), censored: fc.nat(3) }), {
    minLength: 1,
    maxLength: 10,
  });

  it('turns the hazard ratio over when the comparison is swapped (property, fast-check)', () => {
    fc.assert(
      fc.property(series, series, (a: SurvivalTimeCount[], b: SurvivalTimeCount[]) => {
        const one = coxProportionalHazards(
          [
            { conditionId: 'a', counts: a },
            { conditionId: 'b', counts: b },
          ],
          'a',
        ).hazardRatios[0];
        const other = coxProportionalHazards(
          [
            { conditionId: 'a', counts: a },
            { conditionId: 'b', counts: b },
          ],
          'b',
        ).hazardRatios[0];
        if (one.coefficient === null || other.coefficient === null) return true;
        expect(other.coefficient).toBeCloseTo(-one.coefficient, 5);
        expect(other.standardError as number).toBeCloseTo(one.standardError as number, 5);
        return true;
      }),
      { numRuns: 150, seed: 11 },
    );
  });

  it('gives the same fit under Efron and Breslow when no two dropouts share a time (property, fast-check)', () => {
    // Efron (1977): the two approximations differ only in how tied event times are handled.
    const untied = fc
      .uniqueArray(fc.integer({ min: 1, max: 60 }), { minLength: 4, maxLength: 20 })
      .map((times) =>
        times.map((time, i) => ({ time, dropped: i % 2 === 0 ? 1 : 0, censored: i % 2 === 0 ? 0 : 1, arm: i % 3 })),
      );
    fc.assert(
      fc.property(untied, (people) => {
        const groups = [0, 1, 2].map((arm) => ({
          conditionId: `arm-${arm}`,
          counts: people
            .filter((p) => p.arm === arm)
            .map(({ time, dropped, censored }) => ({ time, dropped, censored })),
        }));
        const efron = coxProportionalHazards(groups, 'arm-0');
        const breslow = coxProportionalHazards(groups, 'arm-0', { ties: 'breslow' });
        efron.hazardRatios.forEach((ratio, i) => {
          if (ratio.coefficient === null) return expect(breslow.hazardRatios[i].coefficient).toBeNull();
          expect(breslow.hazardRatios[i].coefficient as number).toBeCloseTo(ratio.coefficient, 6);
        });
      }),
      { numRuns: 150, seed: 5 },
    );
  });

  it('reports conditions without dropouts as not estimable instead of an infinite ratio', () => {
    const result = coxProportionalHazards(
      [
        { conditionId: 'a', counts: [{ time: 3, dropped: 2, censored: 5 }] },
        { conditionId: 'b', counts: [{ time: 4, dropped: 0, censored: 7 }] },
        { conditionId: 'c', counts: [] },
      ],
      'a',
    );
    expect(result.hazardRatios.map((ratio) => ratio.notEstimable)).toEqual(['no-dropouts', 'nobody-randomized']);
    const noComparisonDropouts = coxProportionalHazards(
      [
        { conditionId: 'a', counts: [{ time: 3, dropped: 0, censored: 5 }] },
        { conditionId: 'b', counts: [{ time: 4, dropped: 1, censored: 7 }] },
      ],
      'a',
    );
    expect(noComparisonDropouts.hazardRatios[0].notEstimable).toBe('comparison-has-no-dropouts');
    // B's only dropout comes after everyone in A has left: its likelihood rises without bound as β → −∞.
    const monotone = coxProportionalHazards(
      [
        { conditionId: 'a', counts: [{ time: 1, dropped: 3, censored: 0 }] },
        { conditionId: 'b', counts: [{ time: 20, dropped: 1, censored: 4 }] },
      ],
      'a',
    );
    expect(monotone.hazardRatios[0]).toMatchObject({ hazardRatio: null, notEstimable: 'infinite-estimate' });
  });

  it('names the field of bad input', () => {
    expect(() =>
      coxProportionalHazards([{ conditionId: 'a', counts: [{ time: -1, dropped: 1, censored: 0 }] }], 'a'),
    ).toThrow(/groups\[0\]\.counts\[0\]\.time/);
    expect(() => coxProportionalHazards(freireich, 'nope')).toThrow(/comparisonConditionId/);
  });
});
