import { describe, expect, it } from 'vitest';
import { assessWwcAgainstComparison, assessWwcPair } from './wwc-verdict';

// Two conditions of 2,000 each: differential = |a − b| / 20 percentage points, overall = (a + b) / 40 percent.
function pair(attritedA: number, attritedB: number) {
  return assessWwcPair({ randomized: 2000, attrited: attritedA }, { randomized: 2000, attrited: attritedB });
}
function fromRowAndGap(overallPercent: number, gapTwentieths: number) {
  // a + b = 40·row (+1 when the gap is odd, which moves the overall rate by 0.025 % and keeps the row).
  const total = 40 * overallPercent + (gapTwentieths % 2);
  return pair((total + gapTwentieths) / 2, (total - gapTwentieths) / 2);
}

describe('WWC verdict on both sides of the boundary', () => {
  // Each case: the handbook row's boundary (WWC Procedures and Standards Handbook v4.0 table, data/wwc-attrition-boundaries.csv),
  // a differential exactly on it (low attrition: "at or below") and 0.05 points above it (high attrition).
  const rows = [
    { row: 10, cautious: 6.3, optimistic: 10.9 },
    { row: 20, cautious: 5.4, optimistic: 10.2 },
    { row: 30, cautious: 4.1, optimistic: 8.4 },
    { row: 45, cautious: 1.8, optimistic: 5.1 },
    { row: 57, cautious: 0.0, optimistic: 2.3 },
  ];
  for (const { row, cautious, optimistic } of rows) {
    it(`at ${row} % overall: low at ${cautious} points cautious / ${optimistic} optimistic, high just above`, () => {
      const onCautious = fromRowAndGap(row, Math.round(cautious * 20));
      expect(onCautious.overallPercentRow).toBe(row);
      expect(onCautious.cautious).toEqual({ verdict: 'low-attrition', maxDifferentialPercent: cautious });
      expect(onCautious.optimistic).toEqual({ verdict: 'low-attrition', maxDifferentialPercent: optimistic });

      const aboveCautious = fromRowAndGap(row, Math.round(cautious * 20) + 1);
      expect(aboveCautious.overallPercentRow).toBe(row);
      expect(aboveCautious.cautious.verdict).toBe('high-attrition');
      expect(aboveCautious.optimistic.verdict).toBe('low-attrition');

      const onOptimistic = fromRowAndGap(row, Math.round(optimistic * 20));
      expect(onOptimistic.overallPercentRow).toBe(row);
      expect(onOptimistic.cautious.verdict).toBe('high-attrition');
      expect(onOptimistic.optimistic.verdict).toBe('low-attrition');

      const aboveOptimistic = fromRowAndGap(row, Math.round(optimistic * 20) + 1);
      expect(aboveOptimistic.overallPercentRow).toBe(row);
      expect(aboveOptimistic.optimistic.verdict).toBe('high-attrition');
    });
  }

  it('at 0 % overall (row 0: 5.7 / 10.0), with a small condition losing people and a large one losing none', () => {
    // 57 of 1,000 vs 0 of 20,000: differential 5.7 points, overall 57 / 21,000 = 0.27 % → row 0.
    const on = assessWwcPair({ randomized: 1000, attrited: 57 }, { randomized: 20000, attrited: 0 });
    expect(on.overallPercentRow).toBe(0);
    expect(on.cautious.verdict).toBe('low-attrition');
    expect(assessWwcPair({ randomized: 1000, attrited: 58 }, { randomized: 20000, attrited: 0 }).cautious.verdict).toBe('high-attrition');
    // 100 of 1,000: differential 10.0 points, overall 0.48 % → row 0, on the optimistic line; 101 is above it.
    expect(assessWwcPair({ randomized: 1000, attrited: 100 }, { randomized: 20000, attrited: 0 }).optimistic.verdict).toBe('low-attrition');
    expect(assessWwcPair({ randomized: 1000, attrited: 101 }, { randomized: 20000, attrited: 0 }).optimistic.verdict).toBe('high-attrition');
  });

  it('agrees with the examples of a public R implementation of the WWC standards (RWWC attritest.Rd)', () => {
    // Source: HaiwenChu/RWWC-v.4-Group-Designs, man/attritest.Rd (arguments: analysed and randomized per group):
    // attritest(20,40,31,49) → high attrition; attritest(30,40,40,48) → low optimistically, high cautiously;
    // attritest(10,20,100,200) → low attrition.
    const high = assessWwcPair({ randomized: 40, attrited: 20 }, { randomized: 49, attrited: 18 });
    expect([high.cautious.verdict, high.optimistic.verdict]).toEqual(['high-attrition', 'high-attrition']);
    const split = assessWwcPair({ randomized: 40, attrited: 10 }, { randomized: 48, attrited: 8 });
    expect([split.cautious.verdict, split.optimistic.verdict]).toEqual(['high-attrition', 'low-attrition']);
    const low = assessWwcPair({ randomized: 20, attrited: 10 }, { randomized: 200, attrited: 100 });
    expect([low.cautious.verdict, low.optimistic.verdict]).toEqual(['low-attrition', 'low-attrition']);
  });
});

describe('rounding of the overall rate to a table row', () => {
  it('rounds halves up: 56.5 % reads row 57 and 10.5 % reads row 11', () => {
    expect(pair(1130, 1130).overallPercentRow).toBe(57); // 2,260 / 4,000 = 56.5 %
    expect(pair(210, 210).overallPercentRow).toBe(11); // 420 / 4,000 = 10.5 %
    expect(pair(209, 210).overallPercentRow).toBe(10); // 419 / 4,000 = 10.475 %
  });

  it('says "outside the published range" above 57 %, including 57.5 % which rounds to 58', () => {
    const justAbove = pair(1150, 1150); // 2,300 / 4,000 = 57.5 %
    expect(justAbove.overallPercentRow).toBe(58);
    expect(justAbove.cautious).toEqual({ verdict: 'outside-published-range', maxDifferentialPercent: null });
    expect(justAbove.optimistic.verdict).toBe('outside-published-range');
    // 2,299 / 4,000 = 57.475 % → row 57 (0.0 / 2.3); differential 0.05 points: above the cautious line, below the optimistic.
    const lastRow = pair(1149, 1150);
    expect(lastRow.overallPercentRow).toBe(57);
    expect([lastRow.cautious.verdict, lastRow.optimistic.verdict]).toEqual(['high-attrition', 'low-attrition']);
    expect(pair(1600, 1600).optimistic.verdict).toBe('outside-published-range'); // 80 %
  });

  it('is not computable when a condition has nobody whose window has ended', () => {
    const result = assessWwcPair({ randomized: 0, attrited: 0 }, { randomized: 10, attrited: 1 });
    expect(result.cautious.verdict).toBe('not-computable');
    expect(result.differentialAttritionRate).toBeNull();
  });
});

describe('more than two conditions', () => {
  const conditions = [
    { conditionId: 'landmarks', randomized: 2000, attrited: 200 },
    { conditionId: 'turn-by-turn', randomized: 2000, attrited: 210 },
    { conditionId: 'map-only', randomized: 2000, attrited: 400 },
  ];

  it('judges each other condition against the comparison the researcher picks, and reports the least favourable', () => {
    const result = assessWwcAgainstComparison(conditions, 'landmarks');
    expect(result.comparisonConditionId).toBe('landmarks');
    expect(result.pairs.map((p) => [p.conditionId, p.comparisonConditionId])).toEqual([
      ['turn-by-turn', 'landmarks'],
      ['map-only', 'landmarks'],
    ]);
    // turn-by-turn: overall 410 / 4,000 = 10.25 % → row 10, differential 0.5 points → low under both.
    expect(result.pairs[0].overallPercentRow).toBe(10);
    expect(result.pairs[0].cautious.verdict).toBe('low-attrition');
    // map-only: overall 600 / 4,000 = 15 % → row 15 (5.9 / 10.8), differential 10 points → high cautiously, low optimistically.
    expect(result.pairs[1].overallPercentRow).toBe(15);
    expect(result.pairs[1].cautious.verdict).toBe('high-attrition');
    expect(result.pairs[1].optimistic.verdict).toBe('low-attrition');
    expect(result.cautious).toBe('high-attrition');
    expect(result.optimistic).toBe('low-attrition');
  });

  it('uses the first condition when none is picked, and refuses an unknown one', () => {
    expect(assessWwcAgainstComparison(conditions).comparisonConditionId).toBe('landmarks');
    expect(() => assessWwcAgainstComparison(conditions, 'compass')).toThrow(/comparisonConditionId: "compass" is not one of the study's conditions/);
    expect(() => assessWwcAgainstComparison([conditions[0], conditions[0]])).toThrow(/conditions\[1\]\.conditionId: "landmarks" appears more than once/);
  });

  it('is not computable with a single condition', () => {
    const result = assessWwcAgainstComparison([conditions[0]]);
    expect(result.pairs).toEqual([]);
    expect(result.cautious).toBe('not-computable');
  });
});
