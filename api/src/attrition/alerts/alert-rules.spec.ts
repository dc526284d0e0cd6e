import { describe, expect, it } from 'vitest';
import { type AttritionReportInput, buildAttritionReport } from '../attrition-report';
import { payParity } from '../pay-parity';
import { alertTransition, formatMinor, readAlert } from './alert-rules';

const nobody = { n: 0, sum: 0, sumOfSquares: 0 };

// Two arms whose windows have all ended: `completedInSecond` of 20 complete in the second arm, 20 of 20 in the first.
function input(completedInSecond: number): AttritionReportInput {
  const dropped = 20 - completedInSecond;
  return {
    conditions: [
      {
        conditionId: 'first',
        randomized: 20,
        active: 0,
        completed: 20,
        withdrew: 0,
        lost: 0,
        excludedAfterRandomization: 0,
        windowEnded: { randomized: 20, completed: 20 },
      },
      {
        conditionId: 'second',
        randomized: 20,
        active: 0,
        completed: completedInSecond,
        withdrew: dropped,
        lost: 0,
        excludedAfterRandomization: 0,
        windowEnded: { randomized: 20, completed: completedInSecond },
      },
    ],
    survival: [
      { conditionId: 'first', counts: [{ time: 10, dropped: 0, censored: 20 }] },
      {
        conditionId: 'second',
        counts: [
          { time: 2, dropped, censored: 0 },
          { time: 10, dropped: 0, censored: completedInSecond },
        ],
      },
    ],
    pay: {
      currency: 'EUR',
      payOverrideRecorded: false,
      conditions: [
        {
          conditionId: 'first',
          perRandomized: { n: 20, sum: 20_000, sumOfSquares: 20_000_000 },
          perCompleter: { n: 20, sum: 20_000, sumOfSquares: 20_000_000 },
        },
        {
          conditionId: 'second',
          perRandomized: { n: 20, sum: completedInSecond * 1000, sumOfSquares: completedInSecond * 1_000_000 },
          perCompleter:
            completedInSecond === 0
              ? nobody
              : { n: completedInSecond, sum: completedInSecond * 1000, sumOfSquares: completedInSecond * 1_000_000 },
        },
      ],
    },
    covariates: [],
  };
}

function read(completedInSecond: number, rule: Parameters<typeof readAlert>[0]) {
  const reportInput = input(completedInSecond);
  return readAlert(rule, buildAttritionReport(reportInput), payParity(reportInput.pay), 'EUR');
}

describe('readAlert', () => {
  it('crosses differential attrition on the cautious WWC boundary, and only above it', () => {
    // 19/20 vs 20/20: overall 1/40 = 2.5 % → row 3 (cautious 5.9 points, WWC handbook table); differential 5 points: low.
    const low = read(19, { kind: 'differential-attrition' });
    expect(low).toMatchObject({ crossed: false, value: 0.05 });
    expect(low.threshold).toBeCloseTo(0.059, 12);
    // 18/20: overall 2/40 = 5 % → row 5 (cautious 6.1 points); differential 10 points: high.
    const high = read(18, { kind: 'differential-attrition' });
    expect(high).toMatchObject({ crossed: true, value: 0.1 });
    expect(high.threshold).toBeCloseTo(0.061, 12);
    expect(high.summary).toBe(
      'Differential attrition of 10.0 percentage points is above the cautious WWC boundary of 6.1 percentage points at an overall attrition of 5.0 %.',
    );
  });

  it('crosses the log-rank rule when p falls below the level', () => {
    expect(read(19, { kind: 'log-rank', pValueBelow: 0.05 }).crossed).toBe(false);
    const crossed = read(10, { kind: 'log-rank', pValueBelow: 0.05 });
    expect(crossed.crossed).toBe(true);
    expect(crossed.value as number).toBeLessThan(0.05);
  });

  it('holds the log-rank alert to a conservative interim boundary (p < 0.001) until the planned size, and says why', () => {
    // 10 of 20 dropped in one condition, none in the other: p ≈ 0.0005… is below 0.05 but the check is repeated as data
    // arrive, so before the planned 100 are randomized only p < 0.001 (Haybittle 1971; Peto et al. 1976) raises it.
    const early = readAlert(
      { kind: 'log-rank', pValueBelow: 0.05 },
      buildAttritionReport(input(19)),
      payParity(input(19).pay),
      'EUR',
      { plannedSize: 100 },
    );
    expect(early.threshold).toBe(0.001);
    expect(early.summary).toMatch(/repeated/i);
    const reportInput = input(10);
    const report = buildAttritionReport(reportInput);
    const interim = readAlert({ kind: 'log-rank', pValueBelow: 0.05 }, report, payParity(reportInput.pay), 'EUR', {
      plannedSize: 100,
    });
    expect(interim.threshold).toBe(0.001);
    expect(interim.crossed).toBe((report.survival.logRank.pValue as number) < 0.001);
    // Once the planned size is reached, the researcher's own level applies.
    const final = readAlert({ kind: 'log-rank', pValueBelow: 0.05 }, report, payParity(reportInput.pay), 'EUR', {
      plannedSize: 40,
    });
    expect(final.threshold).toBe(0.05);
    expect(final.crossed).toBe(true);
    expect(final.summary).toMatch(/Checking repeatedly as data arrive inflates false alarms/);
  });

  it('crosses the pay rule only when the difference in mean pay is above the amount', () => {
    // Means 1000 vs 18·1000/20 = 900: a difference of 100 minor units.
    expect(read(18, { kind: 'pay-difference', amountMinor: 100, basis: 'paid' })).toMatchObject({
      crossed: false,
      value: 100,
    });
    expect(read(18, { kind: 'pay-difference', amountMinor: 99, basis: 'paid' })).toMatchObject({
      crossed: true,
      value: 100,
      threshold: 99,
    });
  });
});

describe('alertTransition', () => {
  it('alerts on the way up only, and re-arms on the way down', () => {
    expect([
      alertTransition(false, true),
      alertTransition(true, true),
      alertTransition(true, false),
      alertTransition(false, false),
    ]).toEqual(['crossed', 'unchanged', 'back-below', 'unchanged']);
  });
});

describe('formatMinor', () => {
  it('uses the minor unit of each currency', () => {
    // ISO 4217 minor units (from memory): EUR has 2 decimals, JPY none.
    expect(formatMinor(12_345, 'EUR')).toBe('€123.45');
    expect(formatMinor(12_345, 'JPY')).toBe('¥12,345');
  });
});
