import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { placebo, sixMp } from './freireich-1963.fixture';
import { type SurvivalTimeCount, kaplanMeier } from './kaplan-meier';

describe('kaplanMeier', () => {
  const curve = kaplanMeier(sixMp);
  const at = (time: number) => curve.steps.find((step) => step.time === time);

  it('reproduces the 6-MP product-limit estimates', () => {
    // Source: Freireich et al. (1963) 6-MP group; KM at 6, 7, 10, 13, 16, 22, 23 = 0.8571, 0.8067, 0.7529, 0.6902,
    // 0.6275, 0.5378, 0.4482, the values printed in survival texts (e.g. Kleinbaum & Klein, Survival Analysis; from memory).
    const expected: [number, number][] = [
      [6, 0.8571],
      [7, 0.8067],
      [10, 0.7529],
      [13, 0.6902],
      [16, 0.6275],
      [22, 0.5378],
      [23, 0.4482],
    ];
    for (const [time, survival] of expected) expect(at(time)?.survival).toBeCloseTo(survival, 4);
    expect(curve.atStart).toBe(21);
    expect(at(6)).toMatchObject({ atRisk: 21, dropped: 3, censored: 1 });
    expect(at(35)?.survival).toBeCloseTo(0.4482, 4);
  });

  it('gives Greenwood standard errors and a log-log band', () => {
    // By hand at t = 6: S = 18/21 = 0.857143; Greenwood sum = 3 / (21·18) = 0.0079365; SE = 0.857143·√0.0079365 = 0.07636.
    expect(at(6)?.standardError).toBeCloseTo(0.0764, 4);
    // Log-log band by hand: σ = √0.0079365 / |ln 0.857143| = 0.089087 / 0.154151 = 0.57792; e^(1.96·0.57792) = 3.1041;
    // lower = 0.857143^3.1041 = 0.6197, upper = 0.857143^(1/3.1041) = 0.9516.
    expect(at(6)?.lower).toBeCloseTo(0.6197, 3);
    expect(at(6)?.upper).toBeCloseTo(0.9516, 3);
    // Greenwood SEs at the later dropout times, as printed by R survival::survfit for the 6-MP group (from memory):
    // 7: 0.0869, 10: 0.0963, 13: 0.1068, 16: 0.1141, 22: 0.1282, 23: 0.1346.
    const printed: [number, number][] = [
      [7, 0.0869],
      [10, 0.0963],
      [13, 0.1068],
      [16, 0.1141],
      [22, 0.1282],
      [23, 0.1346],
    ];
    for (const [time, standardError] of printed) expect(at(time)?.standardError).toBeCloseTo(standardError, 4);
    expect(curve.bandForm).toBe('log-log');
    expect(curve.confidenceLevel).toBe(0.95);
  });

  it('equals the empirical survival function when nobody is censored (placebo group)', () => {
    // Kaplan & Meier (1958): without censoring the product-limit estimate is the share still event-free, here (21 − k) / 21.
    const placeboCurve = kaplanMeier(placebo);
    let dropped = 0;
    for (const step of placeboCurve.steps) {
      dropped += step.dropped;
      expect(step.survival).toBeCloseTo((21 - dropped) / 21, 12);
    }
    const last = placeboCurve.steps[placeboCurve.steps.length - 1];
    expect(last.survival).toBe(0);
    expect([last.standardError, last.lower, last.upper]).toEqual([null, null, null]);
  });

  it('collapses the band onto 1 before any dropout, and narrows it at a lower confidence level', () => {
    const early = kaplanMeier([
      { time: 1, dropped: 0, censored: 2 },
      { time: 2, dropped: 1, censored: 3 },
    ]);
    expect(early.steps[0]).toMatchObject({ survival: 1, standardError: 0, lower: 1, upper: 1 });
    const narrow = kaplanMeier(sixMp, { confidenceLevel: 0.8 }).steps[0];
    expect(narrow.lower as number).toBeGreaterThan(at(6)?.lower as number);
    expect(narrow.upper as number).toBeLessThan(at(6)?.upper as number);
  });

  it('merges repeated times, ignores empty entries and refuses impossible counts', () => {
    const merged = kaplanMeier([
      { time: 3, dropped: 1, censored: 0 },
      { time: 1, dropped: 0, censored: 0 },
      { time: 3, dropped: 1, censored: 2 },
    ]);
    expect(merged.steps).toHaveLength(1);
    expect(merged.steps[0]).toMatchObject({ time: 3, atRisk: 4, dropped: 2, censored: 2, survival: 0.5 });
    expect(() => kaplanMeier([{ time: -1, dropped: 1, censored: 0 }])).toThrow(/counts\[0\]\.time: must be ≥ 0/);
    expect(() => kaplanMeier([{ time: 1, dropped: 1.5, censored: 0 }])).toThrow(/counts\[0\]\.dropped/);
    expect(() => kaplanMeier(sixMp, { confidenceLevel: 95 })).toThrow(/confidenceLevel: must be between 0 and 1/);
  });

  it('never increases, stays within [0, 1] and keeps the estimate inside its band', () => {
    const counts = fc.array(fc.record({ time: fc.nat(60), dropped: fc.nat(6), censored: fc.nat(6) }), {
      maxLength: 40,
    });
    fc.assert(
      fc.property(counts, (entries: SurvivalTimeCount[]) => {
        const { steps } = kaplanMeier(entries);
        return steps.every((step, i) => {
          const previous = i === 0 ? 1 : steps[i - 1].survival;
          const inBand =
            step.lower === null ||
            ((step.lower as number) <= step.survival + 1e-12 && step.survival <= (step.upper as number) + 1e-12);
          return step.survival <= previous && step.survival >= 0 && step.survival <= 1 && inBand;
        });
      }),
    );
  });
});

describe('median time to dropout', () => {
  it('reads the published medians of the Freireich (1963) trial: 23 weeks on 6-MP, 8 on placebo (survival texts; from memory)', () => {
    expect(kaplanMeier(sixMp).median).toBe(23);
    expect(kaplanMeier(placebo).median).toBe(8);
    expect(kaplanMeier([{ time: 3, dropped: 1, censored: 9 }]).median).toBeNull();
  });
});
