import chi2test from '@stdlib/stats-chi2test';
import { describe, expect, it } from 'vitest';
import { type AttritionReportInput, buildAttritionReport } from './attrition-report';

// An invented wayfinding study: the map-only condition loses people faster than the landmarks condition.
function studyInput(): AttritionReportInput {
  return {
    conditions: [
      {
        conditionId: 'landmarks',
        randomized: 50,
        active: 5,
        completed: 38,
        withdrew: 4,
        lost: 2,
        excludedAfterRandomization: 1,
        windowEnded: { randomized: 45, completed: 38 },
      },
      {
        conditionId: 'map-only',
        randomized: 50,
        active: 4,
        completed: 26,
        withdrew: 12,
        lost: 7,
        excludedAfterRandomization: 1,
        windowEnded: { randomized: 46, completed: 26 },
      },
    ],
    comparisonConditionId: 'landmarks',
    survival: [
      // Listed out of order on purpose: the report follows the order of `conditions`.
      {
        conditionId: 'map-only',
        counts: [
          { time: 1, dropped: 6, censored: 0 },
          { time: 3, dropped: 8, censored: 2 },
          { time: 7, dropped: 6, censored: 28 },
        ],
      },
      {
        conditionId: 'landmarks',
        counts: [
          { time: 2, dropped: 2, censored: 0 },
          { time: 5, dropped: 3, censored: 3 },
          { time: 7, dropped: 2, censored: 40 },
        ],
      },
    ],
    // Cents: completers earn 1,500; six dropouts per condition were paid 500 for the steps they finished.
    pay: {
      currency: 'EUR',
      payOverrideRecorded: false,
      conditions: [
        {
          conditionId: 'landmarks',
          perRandomized: { n: 50, sum: 60_000, sumOfSquares: 87_000_000 },
          perCompleter: { n: 38, sum: 57_000, sumOfSquares: 85_500_000 },
        },
        {
          conditionId: 'map-only',
          perRandomized: { n: 50, sum: 42_000, sumOfSquares: 60_000_000 },
          perCompleter: { n: 26, sum: 39_000, sumOfSquares: 58_500_000 },
        },
      ],
    },
    covariates: [
      {
        covariate: 'usesNavigationApp',
        kind: 'binary',
        byCondition: [
          { conditionId: 'map-only', allRandomized: { n: 50, count: 26 }, completers: { n: 26, count: 18 } },
          { conditionId: 'landmarks', allRandomized: { n: 50, count: 25 }, completers: { n: 38, count: 19 } },
        ],
      },
    ],
  };
}

describe('buildAttritionReport', () => {
  const report = buildAttritionReport(studyInput());

  it('labels dropout so far and WWC attrition separately, per condition and overall', () => {
    expect(report.conditions.map((c) => [c.conditionId, c.dropped, c.attrited])).toEqual([
      ['landmarks', 7, 7],
      ['map-only', 20, 20],
    ]);
    expect(report.overall).toEqual({
      randomized: 100,
      dropped: 27,
      dropoutRateSoFar: 0.27,
      windowEndedRandomized: 91,
      attrited: 27,
      attritionRate: 27 / 91,
    });
    expect(report.differentialAttrition).toBeCloseTo(20 / 46 - 7 / 45, 15);
  });

  it('gives the WWC verdict for the pair against the chosen comparison', () => {
    // Overall 27 / 91 = 29.7 % → row 30 (4.1 / 8.4, WWC handbook table); differential 27.9 points → high under both.
    expect(report.wwc.pairs).toHaveLength(1);
    expect(report.wwc.pairs[0]).toMatchObject({
      conditionId: 'map-only',
      comparisonConditionId: 'landmarks',
      overallPercentRow: 30,
    });
    expect([report.wwc.cautious, report.wwc.optimistic]).toEqual(['high-attrition', 'high-attrition']);
  });

  it('tests dropout by condition with chi-square, agreeing with @stdlib/stats-chi2test', () => {
    // Source: @stdlib/stats-chi2test 0.2.1 on condition × dropped / not dropped, without Yates' correction.
    const reference = chi2test(
      [
        [7, 43],
        [20, 30],
      ],
      { correct: false },
    );
    expect(report.dropoutTest.method).toBe('chi-square');
    expect(report.dropoutTest.statistic as number).toBeCloseTo(reference.statistic, 10);
    expect(report.dropoutTest.pValue as number).toBeCloseTo(reference.pValue, 12);
    expect(report.dropoutTest.continuityCorrection).toBe(false);
  });

  it('draws one curve per condition in condition order and runs the log-rank test', () => {
    expect(report.survival.curves.map((curve) => curve.conditionId)).toEqual(['landmarks', 'map-only']);
    expect(report.survival.curves[1].steps[0]).toMatchObject({ time: 1, atRisk: 50, dropped: 6 });
    expect(report.survival.logRank.df).toBe(1);
    expect(report.survival.logRank.pValue as number).toBeLessThan(0.05);
  });

  it('summarizes pay and covariate balance against the comparison', () => {
    expect(report.payParity.conditions.map((c) => c.perRandomized.mean)).toEqual([1200, 840]);
    expect(report.payParity.perRandomized.largestMeanDifference).toBe(360);
    expect(report.payParity.perCompleter.test.notComputable).toBe('no-variation-within-a-condition');
    expect(report.covariateBalance).toHaveLength(1);
    expect(report.covariateBalance[0]).toMatchObject({ conditionId: 'map-only', comparisonConditionId: 'landmarks' });
    // By hand: 26/50 = 0.52 vs 25/50 = 0.50 → d = 0.02 / √((0.2496 + 0.25) / 2) = 0.0400.
    expect(report.covariateBalance[0].allRandomized.d).toBeCloseTo(0.04002, 5);
  });

  it('is plain JSON: no NaN, no Infinity, nothing lost in a round trip', () => {
    expect(JSON.parse(JSON.stringify(report))).toEqual(report);
  });

  it('refuses aggregates that do not agree with each other, naming the field', () => {
    const shortSurvival = studyInput();
    shortSurvival.survival = [
      shortSurvival.survival[0],
      { conditionId: 'landmarks', counts: [{ time: 2, dropped: 7, censored: 40 }] },
    ];
    expect(() => buildAttritionReport(shortSurvival)).toThrow(
      /survival\[1\]: counts 47 participants and 7 dropouts for landmarks, but conditions has 50 and 7/,
    );

    const payMismatch = studyInput();
    const [landmarksPay, mapOnlyPay] = payMismatch.pay.conditions;
    payMismatch.pay = {
      ...payMismatch.pay,
      conditions: [landmarksPay, { ...mapOnlyPay, perCompleter: { n: 25, sum: 37_500, sumOfSquares: 56_250_000 } }],
    };
    expect(() => buildAttritionReport(payMismatch)).toThrow(
      /pay\.conditions\[1\]\.perCompleter\.n: must equal the condition's completed count \(26\)/,
    );

    const unknown = studyInput();
    const nobody = { n: 0, sum: 0, sumOfSquares: 0 };
    unknown.pay = {
      ...unknown.pay,
      conditions: [...unknown.pay.conditions, { conditionId: 'compass', perRandomized: nobody, perCompleter: nobody }],
    };
    expect(() => buildAttritionReport(unknown)).toThrow(
      /pay\.conditions: names condition\(s\) that are not in conditions: compass/,
    );

    const missing = studyInput();
    missing.covariates[0].byCondition = missing.covariates[0].byCondition.slice(
      0,
      1,
    ) as (typeof missing.covariates)[0]['byCondition'];
    expect(() => buildAttritionReport(missing)).toThrow(
      /covariates\[0\]\.byCondition: has no entry for condition\(s\) landmarks/,
    );

    expect(() => buildAttritionReport({ ...studyInput(), comparisonConditionId: 'compass' })).toThrow(
      /comparisonConditionId: "compass"/,
    );
  });

  it('judges three conditions pairwise against the comparison', () => {
    const input = studyInput();
    input.conditions = [
      ...input.conditions,
      {
        conditionId: 'turn-by-turn',
        randomized: 50,
        active: 0,
        completed: 36,
        withdrew: 8,
        lost: 6,
        excludedAfterRandomization: 0,
        windowEnded: { randomized: 50, completed: 36 },
      },
    ];
    input.survival = [
      ...input.survival,
      { conditionId: 'turn-by-turn', counts: [{ time: 2, dropped: 14, censored: 36 }] },
    ];
    input.pay.conditions = [
      ...input.pay.conditions,
      {
        conditionId: 'turn-by-turn',
        perRandomized: { n: 50, sum: 54_000, sumOfSquares: 81_000_000 },
        perCompleter: { n: 36, sum: 54_000, sumOfSquares: 81_000_000 },
      },
    ];
    input.covariates = [];
    const three = buildAttritionReport(input);
    expect(three.wwc.pairs.map((pair) => pair.conditionId)).toEqual(['map-only', 'turn-by-turn']);
    expect(three.dropoutTest.df).toBe(2);
    expect(three.dropoutTest.fisherExact).toBeNull();
    expect(three.survival.logRank.df).toBe(2);
    expect(three.payParity.perRandomized.test.df1).toBe(2);
  });
});

describe('buildAttritionReport: stratified tests, hazard ratio and the planned length', () => {
  // The same study split by a randomization stratum; the split adds up to the pooled counts above.
  const strata: AttritionReportInput['strata'] = [
    {
      stratum: 'age=<30',
      conditionId: 'map-only',
      counts: [
        { time: 1, dropped: 4, censored: 0 },
        { time: 3, dropped: 5, censored: 1 },
        { time: 7, dropped: 2, censored: 13 },
      ],
    },
    {
      stratum: 'age=≥30',
      conditionId: 'map-only',
      counts: [
        { time: 1, dropped: 2, censored: 0 },
        { time: 3, dropped: 3, censored: 1 },
        { time: 7, dropped: 4, censored: 15 },
      ],
    },
    {
      stratum: 'age=<30',
      conditionId: 'landmarks',
      counts: [
        { time: 2, dropped: 1, censored: 0 },
        { time: 5, dropped: 2, censored: 1 },
        { time: 7, dropped: 1, censored: 20 },
      ],
    },
    {
      stratum: 'age=≥30',
      conditionId: 'landmarks',
      counts: [
        { time: 2, dropped: 1, censored: 0 },
        { time: 5, dropped: 1, censored: 2 },
        { time: 7, dropped: 1, censored: 20 },
      ],
    },
  ];

  it('names the strata and runs both stratified tests on the same people as the pooled ones', () => {
    const report = buildAttritionReport({ ...studyInput(), strata });
    expect(report.stratified.strata).toEqual(['age=<30', 'age=≥30']);
    expect(report.stratified.stratified).toBe(true);
    expect(report.stratified.cmh).toMatchObject({ method: 'cochran-mantel-haenszel', df: 1, strataUsed: 2 });
    expect(report.stratified.logRank?.groups.map((g) => g.observed)).toEqual([7, 20]);
    expect(report.stratified.logRank?.pValue as number).toBeLessThan(0.05);
  });

  it('says there is nothing to stratify by with one stratum, and refuses strata that do not add up', () => {
    const one = buildAttritionReport({
      ...studyInput(),
      strata: studyInput().survival.map((entry) => ({ stratum: 'all', ...entry })),
    });
    expect(one.stratified).toEqual({ strata: ['all'], stratified: false, cmh: null, logRank: null });
    expect(() => buildAttritionReport({ ...studyInput(), strata: strata!.slice(1) })).toThrow(/strata.*map-only/);
  });

  it('fits the hazard ratio against the comparison and reads cumulative dropout at the planned length', () => {
    const report = buildAttritionReport({ ...studyInput(), plannedLength: { days: 7, unknown: null } });
    expect(report.survival.cox.ties).toBe('efron');
    const [mapOnly] = report.survival.cox.hazardRatios;
    expect(mapOnly.conditionId).toBe('map-only');
    expect(mapOnly.hazardRatio as number).toBeGreaterThan(1);
    expect(mapOnly.lower as number).toBeLessThan(mapOnly.hazardRatio as number);
    // Landmarks: S(7) = (48/50)(45/48)(40/42) by hand (50 at risk, 2 out; 48, 3 out; 42, 2 out), so cumulative dropout is 1 minus that.
    const landmarks = report.survival.plannedLength.conditions[0];
    expect(landmarks.cumulative?.cumulative as number).toBeCloseTo(1 - (48 / 50) * (45 / 48) * (40 / 42), 12);
    const later = buildAttritionReport({ ...studyInput(), plannedLength: { days: 30, unknown: null } });
    expect(later.survival.plannedLength.conditions.every((c) => c.cumulative === null && c.longestFollowUp === 7)).toBe(
      true,
    );
  });
});
