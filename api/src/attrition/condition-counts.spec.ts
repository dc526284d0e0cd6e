import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { attritionRate, differentialAttrition, overallAttrition } from './attrition-rates';
import { AttritionInputError } from './attrition-input-error';
import { type ConditionStatusCounts, summarizeCondition } from './condition-counts';

const running: ConditionStatusCounts = {
  conditionId: 'map-first',
  randomized: 40,
  active: 10,
  completed: 22,
  withdrew: 4,
  lost: 3,
  excludedAfterRandomization: 1,
  windowEnded: { randomized: 30, completed: 22 },
};

describe('summarizeCondition', () => {
  it('counts withdrew, lost and excluded after randomization as dropped, and keeps the two rates apart', () => {
    const summary = summarizeCondition(running);
    // Hand count: dropped = 4 + 3 + 1 = 8; so far 8 / 40 = 0.2; WWC attrition over ended windows (30 − 22) / 30.
    expect(summary.dropped).toBe(8);
    expect(summary.dropoutRateSoFar).toBe(0.2);
    expect(summary.attrited).toBe(8);
    expect(summary.attritionRate).toBeCloseTo(8 / 30, 15);
  });

  it('gives null rather than NaN when nobody is randomized or nobody has reached the end of their window', () => {
    const empty = summarizeCondition({
      ...running,
      randomized: 0,
      active: 0,
      completed: 0,
      withdrew: 0,
      lost: 0,
      excludedAfterRandomization: 0,
      windowEnded: { randomized: 0, completed: 0 },
    });
    expect(empty.dropoutRateSoFar).toBeNull();
    expect(empty.attritionRate).toBeNull();
    expect(summarizeCondition({ ...running, windowEnded: { randomized: 0, completed: 0 } }).attritionRate).toBeNull();
  });

  it('refuses counts whose statuses do not add up to the randomized count, naming the field', () => {
    expect(() => summarizeCondition({ ...running, randomized: 41 }, 'conditions[1]')).toThrowError(
      new AttritionInputError(
        'conditions[1].randomized',
        'must equal active + completed + withdrew + lost + excludedAfterRandomization + incompleteAtClose (40), got 41',
      ),
    );
  });

  it('refuses negative, fractional and impossible window counts', () => {
    expect(() => summarizeCondition({ ...running, lost: -1 })).toThrow(/condition\.lost: must be a whole number/);
    expect(() => summarizeCondition({ ...running, active: 9.5, completed: 22.5 })).toThrow(/condition\.active/);
    expect(() => summarizeCondition({ ...running, windowEnded: { randomized: 41, completed: 0 } })).toThrow(
      /windowEnded\.randomized: must not exceed randomized \(40\), got 41/,
    );
    expect(() => summarizeCondition({ ...running, windowEnded: { randomized: 30, completed: 23 } })).toThrow(
      /windowEnded\.completed: must not exceed completed \(22\), got 23/,
    );
    expect(() => summarizeCondition({ ...running, conditionId: '' })).toThrow(/condition\.conditionId/);
  });
});

describe('overall and differential attrition', () => {
  it('matches the worked examples of a public R implementation of the WWC standards (RWWC attrit.Rd)', () => {
    // Source: HaiwenChu/RWWC-v.4-Group-Designs, man/attrit.Rd: attrit(20,40,31,49) → overall 43 %, differential 13 %;
    // attrit(30,40,40,48) → overall 20 %, differential 8 % (arguments: analysed and randomized per group).
    const first = [
      { randomized: 40, attrited: 20 },
      { randomized: 49, attrited: 18 },
    ];
    expect(Math.round((overallAttrition(first) as number) * 100)).toBe(43);
    expect(Math.round((differentialAttrition(first) as number) * 100)).toBe(13);
    const second = [
      { randomized: 40, attrited: 10 },
      { randomized: 48, attrited: 8 },
    ];
    expect(Math.round((overallAttrition(second) as number) * 100)).toBe(20);
    expect(Math.round((differentialAttrition(second) as number) * 100)).toBe(8);
  });

  it('takes the largest minus the smallest rate with more than two conditions, ignoring empty ones', () => {
    const rates = [
      { randomized: 100, attrited: 10 },
      { randomized: 100, attrited: 25 },
      { randomized: 100, attrited: 15 },
      { randomized: 0, attrited: 0 },
    ];
    expect(differentialAttrition(rates)).toBeCloseTo(0.15, 15);
    expect(differentialAttrition([{ randomized: 10, attrited: 1 }])).toBeNull();
    expect(overallAttrition([])).toBeNull();
    expect(() => attritionRate({ randomized: 5, attrited: 6 }, 'pair[0]')).toThrow(
      /pair\[0\]\.attrited: must not exceed randomized \(5\), got 6/,
    );
  });
});

const conditionCounts = fc
  .record({
    active: fc.nat(200),
    completedEnded: fc.nat(200),
    completedRunning: fc.nat(50),
    withdrew: fc.nat(200),
    lost: fc.nat(200),
    excludedAfterRandomization: fc.nat(20),
    activeEnded: fc.nat(50),
  })
  .map(
    ({
      active,
      completedEnded,
      completedRunning,
      withdrew,
      lost,
      excludedAfterRandomization,
      activeEnded,
    }): ConditionStatusCounts => {
      const randomized = active + completedEnded + completedRunning + withdrew + lost + excludedAfterRandomization;
      const endedActive = Math.min(activeEnded, active);
      return {
        conditionId: 'c',
        randomized,
        active,
        completed: completedEnded + completedRunning,
        withdrew,
        lost,
        excludedAfterRandomization,
        // Everyone who dropped out has ended their participation, plus some completers and active people past their window.
        windowEnded: {
          randomized: completedEnded + withdrew + lost + excludedAfterRandomization + endedActive,
          completed: completedEnded,
        },
      };
    },
  );

describe('properties', () => {
  it('keeps every rate within [0, 1]', () => {
    fc.assert(
      fc.property(fc.array(conditionCounts, { minLength: 1, maxLength: 5 }), (conditions) => {
        const summaries = conditions.map((condition) => summarizeCondition(condition));
        const inUnit = (rate: number | null) => rate === null || (rate >= 0 && rate <= 1);
        const counts = summaries.map((summary) => ({
          randomized: summary.windowEnded.randomized,
          attrited: summary.attrited,
        }));
        return (
          summaries.every((summary) => inUnit(summary.dropoutRateSoFar) && inUnit(summary.attritionRate)) &&
          inUnit(overallAttrition(counts)) &&
          inUnit(differentialAttrition(counts))
        );
      }),
    );
  });

  it('never raises a condition’s attrition when one more participant completes', () => {
    fc.assert(
      fc.property(conditionCounts, (condition) => {
        const before = summarizeCondition(condition);
        const after = summarizeCondition({
          ...condition,
          randomized: condition.randomized + 1,
          completed: condition.completed + 1,
          windowEnded: {
            randomized: condition.windowEnded.randomized + 1,
            completed: condition.windowEnded.completed + 1,
          },
        });
        const notHigher = (later: number | null, earlier: number | null) =>
          earlier === null || (later as number) <= earlier;
        return (
          notHigher(after.attritionRate, before.attritionRate) &&
          notHigher(after.dropoutRateSoFar, before.dropoutRateSoFar)
        );
      }),
    );
  });
});
