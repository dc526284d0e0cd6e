import { describe, expect, it } from 'vitest';
import { buildAttritionReport } from './attrition-report';
import { REASONS_SHOWN, consortFlow, statusCounts, toReportInput } from './attrition-input';
import type { AttritionAggregates, FlowRow } from './attrition-sql';

const arms = [
  { id: 'a', name: 'A' },
  { id: 'b', name: 'B' },
];
const row = (arm: string | null, status: string, n: number, extra: Partial<FlowRow> = {}): FlowRow => ({
  arm,
  status,
  assigned: arm !== null,
  reason: null,
  n,
  ...extra,
});

describe('statusCounts', () => {
  const flow = [
    row('a', 'completed', 6),
    row('a', 'active', 2),
    row('a', 'assigned', 1),
    row('a', 'withdrew', 1),
    row('b', 'excluded', 2),
    row('b', 'lost', 3),
    row(null, 'excluded', 4),
    row(null, 'invited', 9),
  ];

  it('ends the window only for those who finished while the study runs, for everyone once it is closed', () => {
    const running = statusCounts(flow, arms, false);
    expect(running[0]).toEqual({
      conditionId: 'a',
      randomized: 10,
      active: 3,
      completed: 6,
      withdrew: 1,
      lost: 0,
      excludedAfterRandomization: 0,
      incompleteAtClose: 0,
      windowEnded: { randomized: 7, completed: 6 },
    });
    expect(running[1]).toMatchObject({
      randomized: 5,
      excludedAfterRandomization: 2,
      lost: 3,
      windowEnded: { randomized: 5, completed: 0 },
    });
    expect(statusCounts(flow, arms, true)[0]).toMatchObject({
      active: 0,
      incompleteAtClose: 3,
      windowEnded: { randomized: 10, completed: 6 },
    });
  });

  it('gives an arm nobody was assigned to all zeros', () => {
    expect(statusCounts([], arms, false)[1]).toMatchObject({
      randomized: 0,
      windowEnded: { randomized: 0, completed: 0 },
    });
  });
});

describe('consortFlow', () => {
  it('separates exclusion before and after randomization and caps the reasons listed', () => {
    const reasons = Array.from({ length: REASONS_SHOWN + 2 }, (_, i) =>
      row('b', 'withdrew', i + 1, { reason: `reason ${String(i).padStart(2, '0')}` }),
    );
    const flow = consortFlow(
      [
        row(null, 'excluded', 2, { reason: 'age' }),
        row('a', 'excluded', 1, { reason: 'review' }),
        row(null, 'screened', 3),
        ...reasons,
      ],
      arms,
    );
    expect(flow.excludedBeforeRandomization).toEqual({
      total: 2,
      reasons: [{ reason: 'age', count: 2 }],
      otherReasons: 0,
    });
    expect(flow.arms[0].excludedAfterRandomization.total).toBe(1);
    expect(flow.awaitingRandomization).toEqual({ total: 3, invited: 0, screened: 3, consented: 0 });
    // 1 + 2 + … + 12 = 78 withdrew; the ten largest (3 … 12 = 75) are listed, the other 3 people summed.
    expect(flow.arms[1].withdrew.total).toBe(78);
    expect(flow.arms[1].withdrew.reasons).toHaveLength(REASONS_SHOWN);
    expect(flow.arms[1].withdrew.reasons[0]).toEqual({ reason: 'reason 11', count: 12 });
    expect(flow.arms[1].withdrew.otherReasons).toBe(3);
    expect(flow.assessedForEligibility).toBe(2 + 1 + 3 + 78);
  });
});

describe('toReportInput', () => {
  it('turns categorical covariates into one indicator per category and feeds a consistent report', () => {
    const aggregates: AttritionAggregates = {
      flow: [row('a', 'completed', 2), row('b', 'completed', 1), row('b', 'withdrew', 1)],
      survival: [
        { arm: 'a', day: 10, dropped: 0, censored: 2 },
        { arm: 'b', day: 3, dropped: 1, censored: 0 },
        { arm: 'b', day: 10, dropped: 0, censored: 1 },
      ],
      pay: [
        {
          arm: 'a',
          randomized: 2,
          completed: 2,
          paid_sum: '3000',
          paid_squares: 4_500_000,
          paid_completer_sum: '3000',
          paid_completer_squares: 4_500_000,
          earned_sum: '3000',
          earned_squares: 4_500_000,
          earned_completer_sum: '3000',
          earned_completer_squares: 4_500_000,
        },
        {
          arm: 'b',
          randomized: 2,
          completed: 1,
          paid_sum: '1500',
          paid_squares: 2_250_000,
          paid_completer_sum: '1500',
          paid_completer_squares: 2_250_000,
          earned_sum: '2000',
          earned_squares: 2_500_000,
          earned_completer_sum: '1500',
          earned_completer_squares: 2_250_000,
        },
      ],
      covariates: [
        {
          arm: 'a',
          key: 'device',
          kind: 'string',
          category: 'phone',
          n: 1,
          sum: null,
          squares: null,
          completer_n: 1,
          completer_sum: null,
          completer_squares: null,
        },
        {
          arm: 'a',
          key: 'device',
          kind: 'string',
          category: 'laptop',
          n: 1,
          sum: null,
          squares: null,
          completer_n: 1,
          completer_sum: null,
          completer_squares: null,
        },
        {
          arm: 'b',
          key: 'device',
          kind: 'string',
          category: 'phone',
          n: 2,
          sum: null,
          squares: null,
          completer_n: 1,
          completer_sum: null,
          completer_squares: null,
        },
        {
          arm: 'b',
          key: 'glasses',
          kind: 'boolean',
          category: 'false',
          n: 2,
          sum: null,
          squares: null,
          completer_n: 1,
          completer_sum: null,
          completer_squares: null,
        },
      ],
      strata: [],
      steps: [{ opens_after_days: 0, opens_from: 'assignment', due_within_days: 7 }],
      payOverrideRecorded: false,
    };
    const { report, earned } = toReportInput(aggregates, arms, { studyClosed: false, currency: 'EUR' });
    expect(report.covariates.map((c) => c.covariate)).toEqual(['device=laptop', 'device=phone', 'glasses=true']);
    const phone = report.covariates[1];
    expect(phone.byCondition).toEqual([
      { conditionId: 'a', allRandomized: { n: 2, count: 1 }, completers: { n: 2, count: 1 } },
      { conditionId: 'b', allRandomized: { n: 2, count: 2 }, completers: { n: 1, count: 1 } },
    ]);
    // A boolean answered only "false": the "true" indicator still exists, with no one having it.
    expect(report.covariates[2].byCondition[1].allRandomized).toEqual({ n: 2, count: 0 });
    expect(earned.conditions[1].perRandomized).toEqual({ n: 2, sum: 2000, sumOfSquares: 2_500_000 });
    const built = buildAttritionReport(report);
    expect(built.payParity.conditions.map((c) => c.perRandomized.mean)).toEqual([1500, 750]);
    expect(built.survival.plannedLength.days).toBe(7);
    expect(built.stratified).toMatchObject({ stratified: false, cmh: null, logRank: null });
  });
});
