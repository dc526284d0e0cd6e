import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { consortFlow, toReportInput } from './attrition-input';
import { buildAttritionReport } from './attrition-report';
import type { AttritionAggregates } from './attrition-sql';
import { type FollowedGroupRow, splitFollowedGroups } from './followed-groups';

const arms = [
  { id: 'a', name: 'A' },
  { id: 'b', name: 'B' },
  { id: 'c', name: 'C' },
];
const nobody = { n: 0, sum: 0, sumOfSquares: 0 };

/** Grouped enrollments as the SQL returns them, turned into a whole report the way the service does it. */
function reportOf(rows: FollowedGroupRow[], studyClosed: boolean) {
  const { flow, survival, strata } = splitFollowedGroups(rows, studyClosed);
  const count = (arm: string, completed?: boolean) =>
    flow
      .filter(
        (r) => r.arm === arm && r.assigned && (completed === undefined || (r.status === 'completed') === completed),
      )
      .reduce((t, r) => t + r.n, 0);
  const aggregates: AttritionAggregates = {
    flow,
    survival,
    pay: arms.map((arm) => ({
      arm: arm.id,
      randomized: count(arm.id),
      completed: count(arm.id, true),
      paid_sum: '0',
      paid_squares: 0,
      paid_completer_sum: '0',
      paid_completer_squares: 0,
      earned_sum: '0',
      earned_squares: 0,
      earned_completer_sum: '0',
      earned_completer_squares: 0,
    })),
    covariates: [],
    strata,
    steps: [],
    payOverrideRecorded: false,
  };
  const input = toReportInput(aggregates, arms, { studyClosed, currency: 'EUR' });
  input.report.pay.conditions.forEach((c) => {
    if (c.perRandomized.n === 0) Object.assign(c, { perRandomized: nobody });
  });
  return { report: buildAttritionReport(input.report), flow: consortFlow(flow, arms, studyClosed) };
}

const statuses = ['assigned', 'active', 'completed', 'withdrew', 'lost', 'excluded'] as const;
const groupRow = fc.record({
  arm: fc.constantFrom('a', 'b', 'c'),
  status: fc.constantFrom(...statuses),
  stratum: fc.constantFrom('age=<30', 'age=≥30', null),
  day: fc.double({ min: 0, max: 40, noNaN: true }),
  n: fc.integer({ min: 1, max: 6 }),
});

describe('one counting rule for people still active', () => {
  it('in a closed study counts them as not completed in every panel: WWC, the dropout test, the curves and the flow', () => {
    // A: 6 completed, 2 withdrew, 2 still active when the study closed on day 30.
    const rows: FollowedGroupRow[] = [
      { arm: 'a', status: 'completed', assigned: true, reason: null, randomized: true, day: 10, n: 6 },
      { arm: 'a', status: 'withdrew', assigned: true, reason: null, randomized: true, day: 2, n: 2 },
      { arm: 'a', status: 'active', assigned: true, reason: null, randomized: true, day: 30, n: 2 },
      { arm: 'b', status: 'completed', assigned: true, reason: null, randomized: true, day: 10, n: 9 },
      { arm: 'b', status: 'withdrew', assigned: true, reason: null, randomized: true, day: 3, n: 1 },
      { arm: 'c', status: 'completed', assigned: true, reason: null, randomized: true, day: 10, n: 10 },
    ];
    const { report, flow } = reportOf(rows, true);
    const a = report.conditions[0];
    expect(a).toMatchObject({ active: 0, incompleteAtClose: 2, dropped: 4, attrited: 4 });
    expect(report.dropoutTest.chiSquare?.expected[0][0]).toBeCloseTo((10 * 5) / 30, 12); // 4 + 1 + 0 dropped of 30
    const curveA = report.survival.curves[0];
    expect(curveA.steps.at(-1)).toMatchObject({ time: 30, dropped: 2, censored: 0 });
    expect(flow.arms[0]).toMatchObject({ stillInFollowUp: 0, incompleteAtClose: 2, analysed: 10, completers: 6 });
  });

  it('while the study runs leaves them out of WWC attrition, as not (yet) dropped in the test, censored in the curves', () => {
    const rows: FollowedGroupRow[] = [
      { arm: 'a', status: 'completed', assigned: true, reason: null, randomized: true, day: 10, n: 3 },
      { arm: 'a', status: 'active', assigned: true, reason: null, randomized: true, day: 12.5, n: 2 },
      { arm: 'b', status: 'withdrew', assigned: true, reason: null, randomized: true, day: 1, n: 1 },
      { arm: 'c', status: 'completed', assigned: true, reason: null, randomized: true, day: 10, n: 1 },
    ];
    const { report, flow } = reportOf(rows, false);
    expect(report.conditions[0]).toMatchObject({
      active: 2,
      incompleteAtClose: 0,
      dropped: 0,
      attrited: 0,
      windowEnded: { randomized: 3, completed: 3 },
    });
    expect(report.survival.curves[0].steps.at(-1)).toMatchObject({ time: 12.5, dropped: 0, censored: 2 });
    expect(flow.arms[0]).toMatchObject({ stillInFollowUp: 2, incompleteAtClose: 0 });
  });

  it('is identical across panels for any history (property, fast-check)', () => {
    fc.assert(
      fc.property(fc.array(groupRow, { minLength: 1, maxLength: 25 }), fc.boolean(), (drawn, closed) => {
        const rows: FollowedGroupRow[] = drawn.map((r) => ({ ...r, assigned: true, reason: null, randomized: true }));
        const { report, flow } = reportOf(rows, closed);
        report.conditions.forEach((condition, i) => {
          const curveDropped = report.survival.curves[i].steps.reduce((t, s) => t + s.dropped, 0);
          expect(curveDropped).toBe(condition.dropped);
          const arm = flow.arms[i];
          expect(
            arm.withdrew.total +
              arm.lostToFollowUp.total +
              arm.excludedAfterRandomization.total +
              arm.incompleteAtClose,
          ).toBe(condition.dropped);
          expect(arm.stillInFollowUp).toBe(condition.active);
          if (closed) {
            // Once closed, everyone's window has ended and WWC attrition is exactly the dropouts.
            expect(condition.attrited).toBe(condition.dropped);
            expect(condition.active).toBe(0);
          } else {
            expect(condition.windowEnded.randomized).toBe(condition.randomized - condition.active);
          }
        });
        // The stratified tests count the same people the same way: their observed dropouts add up to the pooled ones.
        if (report.stratified.logRank !== null) {
          report.conditions.forEach((condition, i) =>
            expect(report.stratified.logRank!.groups[i].observed).toBe(condition.dropped),
          );
        }
        const tableDropped =
          report.dropoutTest.chiSquare === null ? null : report.dropoutTest.chiSquare.expected.flat().length;
        if (tableDropped !== null) {
          const rowsTested = report.conditions.filter((c) => c.randomized > 0);
          const observedDropped = rowsTested.reduce((t, c) => t + c.dropped, 0);
          const expectedDropped = report.dropoutTest.chiSquare!.expected.reduce((t, row) => t + row[0], 0);
          expect(expectedDropped).toBeCloseTo(observedDropped, 9);
        }
      }),
      { numRuns: 200, seed: 3 },
    );
  });
});

describe('CONSORT analysis box', () => {
  it('counts everyone allocated as analysed by intention to treat, with the completers beside it', () => {
    const rows: FollowedGroupRow[] = [
      { arm: 'a', status: 'completed', assigned: true, reason: null, randomized: true, day: 10, n: 6 },
      { arm: 'a', status: 'lost', assigned: true, reason: null, randomized: true, day: 5, n: 3 },
      { arm: 'a', status: 'active', assigned: true, reason: null, randomized: true, day: 11, n: 1 },
    ];
    const flow = consortFlow(splitFollowedGroups(rows, false).flow, arms, false);
    expect(flow.arms[0]).toMatchObject({ allocated: 10, analysed: 10, completers: 6 });
  });
});
