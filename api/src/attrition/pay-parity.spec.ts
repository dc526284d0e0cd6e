import ttest2 from '@stdlib/stats-ttest2';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { type ConditionPayInput, payParity, welchAnova, welchDifferenceInterval } from './pay-parity';
import { type Moments, meanAndVariance } from './sufficient-statistics';

function moments(values: number[]): Moments {
  return {
    n: values.length,
    sum: values.reduce((s, x) => s + x, 0),
    sumOfSquares: values.reduce((s, x) => s + x * x, 0),
  };
}

describe('welchAnova', () => {
  it('reproduces R’s oneway.test on the sleep data (two groups: Welch’s t-test squared)', () => {
    // Source: Cushny & Peebles sleep data (R datasets::sleep); R oneway.test(extra ~ group, sleep) gives F = 3.4626,
    // num df = 1, denom df = 17.776, p = 0.07939, i.e. Welch t = −1.8608 (from memory; scipy ttest_ind(equal_var=False) agrees).
    const result = welchAnova([
      { conditionId: '1', ...moments([0.7, -1.6, -0.2, -1.2, -0.1, 3.4, 3.7, 0.8, 0.0, 2.0]) },
      { conditionId: '2', ...moments([1.9, 0.8, 1.1, 0.1, -0.1, 4.4, 5.5, 1.6, 4.6, 3.4]) },
    ]);
    expect(result.statistic).toBeCloseTo(3.4626, 4);
    expect(result.df1).toBe(1);
    expect(result.df2).toBeCloseTo(17.776, 3);
    expect(result.pValue).toBeCloseTo(0.07939, 5);
  });

  it('reproduces R’s oneway.test on PlantGrowth (three groups)', () => {
    // Source: R datasets::PlantGrowth; oneway.test(weight ~ group, PlantGrowth) gives F = 5.181, num df = 2,
    // denom df = 17.128, p = 0.01739 (from memory).
    const result = welchAnova([
      { conditionId: 'ctrl', ...moments([4.17, 5.58, 5.18, 6.11, 4.5, 4.61, 5.17, 4.53, 5.33, 5.14]) },
      { conditionId: 'trt1', ...moments([4.81, 4.17, 4.41, 3.59, 5.87, 3.83, 6.03, 4.89, 4.32, 4.69]) },
      { conditionId: 'trt2', ...moments([6.31, 5.12, 5.54, 5.5, 5.37, 5.29, 4.92, 6.15, 5.8, 5.26]) },
    ]);
    expect(result.statistic).toBeCloseTo(5.181, 3);
    expect(result.df1).toBe(2);
    expect(result.df2).toBeCloseTo(17.128, 3);
    expect(result.pValue).toBeCloseTo(0.01739, 5);
  });
});

describe('payParity', () => {
  // Invented amounts in cents: completers earn 1,500; dropouts 0 or 500 for the steps they finished.
  const landmarks: ConditionPayInput = {
    conditionId: 'landmarks',
    perRandomized: moments([1500, 1500, 1500, 500, 0]),
    perCompleter: moments([1500, 1500, 1500]),
  };
  const mapOnly: ConditionPayInput = {
    conditionId: 'map-only',
    perRandomized: moments([1500, 1500, 0, 0]),
    perCompleter: moments([1500, 1500]),
  };

  it('gives mean pay per randomized participant and per completer by condition', () => {
    const result = payParity({ currency: 'EUR', payOverrideRecorded: false, conditions: [landmarks, mapOnly] });
    // By hand: landmarks 5,000 / 5 = 1,000 per randomized; map-only 3,000 / 4 = 750; both 1,500 per completer.
    expect(result.conditions.map((c) => c.perRandomized.mean)).toEqual([1000, 750]);
    expect(result.conditions.map((c) => c.perCompleter.mean)).toEqual([1500, 1500]);
    expect(result.perRandomized.largestMeanDifference).toBe(250);
    expect(result.perCompleter.largestMeanDifference).toBe(0);
    // landmarks per randomized: Σx² = 3·1500² + 500² = 7,000,000; s² = (7,000,000 − 5,000²/5) / 4 = 500,000.
    expect(result.conditions[0].perRandomized.standardDeviation).toBeCloseTo(Math.sqrt(500_000), 9);
    expect(result.perRandomized.test.pValue).toBeGreaterThan(0);
    expect(result.currency).toBe('EUR');
  });

  it('says the test is not computable when pay does not vary within a condition (fixed pay for completers)', () => {
    const result = payParity({ currency: 'EUR', payOverrideRecorded: false, conditions: [landmarks, mapOnly] });
    expect(result.perCompleter.test).toMatchObject({
      statistic: null,
      pValue: null,
      notComputable: 'no-variation-within-a-condition',
    });
  });

  it('leaves out conditions with fewer than two participants and says which were tested', () => {
    const result = welchAnova([
      { conditionId: 'a', ...moments([1, 2, 3]) },
      { conditionId: 'b', ...moments([5]) },
      { conditionId: 'c', ...moments([2, 4, 9]) },
    ]);
    expect(result.conditionIdsTested).toEqual(['a', 'c']);
    expect(result.df1).toBe(1);
    expect(welchAnova([{ conditionId: 'a', ...moments([1, 2]) }]).notComputable).toBe(
      'fewer-than-two-conditions-with-two-or-more-participants',
    );
  });

  it('passes the pay-override flag through', () => {
    expect(
      payParity({ currency: 'usd', payOverrideRecorded: true, conditions: [landmarks, mapOnly] }).payOverrideRecorded,
    ).toBe(true);
  });

  it('refuses impossible aggregates, naming the field', () => {
    expect(() => meanAndVariance({ n: 3, sum: 30, sumOfSquares: 200 }, 'pay')).toThrow(
      /pay\.sumOfSquares: is smaller than sum² \/ n/,
    );
    expect(() => meanAndVariance({ n: 0, sum: 5, sumOfSquares: 25 }, 'pay')).toThrow(
      /pay: sum and sumOfSquares must be 0 when n is 0/,
    );
    expect(() =>
      payParity({
        currency: 'EUR',
        payOverrideRecorded: false,
        conditions: [{ ...landmarks, perCompleter: { n: 1, sum: -5, sumOfSquares: 25 } }, mapOnly],
      }),
    ).toThrow(/pay\.conditions\[0\]\.perCompleter\.sum: amounts paid cannot be negative/);
    expect(() => payParity({ currency: 'euro', payOverrideRecorded: false, conditions: [] })).toThrow(/pay\.currency/);
  });
});

const mean = (values: number[]) => values.reduce((s, v) => s + v, 0) / values.length;

describe('welchDifferenceInterval', () => {
  const momentsOf = (values: number[]): Moments => ({
    n: values.length,
    sum: values.reduce((s, v) => s + v, 0),
    sumOfSquares: values.reduce((s, v) => s + v * v, 0),
  });

  it('matches the Welch interval of @stdlib/stats-ttest2 on raw amounts (property, fast-check)', () => {
    // Outside reference: @stdlib/stats-ttest2 (default variance "unequal": Welch test, Satterthwaite df), given every value.
    const amounts = fc.array(fc.integer({ min: 0, max: 5000 }), { minLength: 2, maxLength: 40 });
    fc.assert(
      fc.property(amounts, amounts, (x, y) => {
        const ours = welchDifferenceInterval(
          { conditionId: 'x', ...momentsOf(x) },
          { conditionId: 'y', ...momentsOf(y) },
        );
        if (ours.notComputable !== null) return new Set([...x]).size === 1 && new Set([...y]).size === 1;
        const theirs = ttest2(x, y);
        expect(ours.difference as number).toBeCloseTo(mean(x) - mean(y), 6);
        expect(ours.lower as number).toBeCloseTo(theirs.ci[0], 4);
        expect(ours.upper as number).toBeCloseTo(theirs.ci[1], 4);
        expect(ours.df as number).toBeCloseTo(theirs.df, 4);
        return true;
      }),
      { numRuns: 200, seed: 23 },
    );
  });

  it('is not computable below two people or without any variation, and payParity lists each arm against the comparison', () => {
    expect(
      welchDifferenceInterval(
        { conditionId: 'a', n: 1, sum: 5, sumOfSquares: 25 },
        { conditionId: 'b', ...momentsOf([1, 2]) },
      ).notComputable,
    ).toBe('fewer-than-two-in-a-condition');
    expect(
      welchDifferenceInterval({ conditionId: 'a', ...momentsOf([3, 3]) }, { conditionId: 'b', ...momentsOf([1, 1]) }),
    ).toMatchObject({
      difference: 2,
      lower: null,
      notComputable: 'no-variation-in-either-condition',
    });
    const result = payParity({
      currency: 'EUR',
      payOverrideRecorded: false,
      comparisonConditionId: 'b',
      conditions: ['a', 'b', 'c'].map((conditionId, i) => ({
        conditionId,
        perRandomized: momentsOf([100 * i, 100 * i + 50, 10]),
        perCompleter: momentsOf([500, 600]),
      })),
    });
    expect(result.perRandomized.differences.map((d) => `${d.conditionId}-${d.comparisonConditionId}`)).toEqual([
      'a-b',
      'c-b',
    ]);
  });
});
