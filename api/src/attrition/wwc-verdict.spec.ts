import { describe, expect, it } from 'vitest';
import { assessWwcAgainstComparison, assessWwcPair } from './wwc-verdict';

// Two conditions of 2,000 each: differential = |a − b| / 20 percentage points, overall = (a + b) / 40 percent.
function pair(attritedA: number, attritedB: number) {
  return assessWwcPair({ randomized: 2000, attrited: attritedA }, { randomized: 2000, attrited: attritedB });
}
function fromRowAndGap(overallPercent: number, gapTwentieths: number) {
  // 4,000 per condition: overall exactly on the row (a + b = 80·row), differential |a − b| / 40 points.
  const total = 80 * overallPercent;
  const gap = 2 * gapTwentieths;
  return assessWwcPair(
    { randomized: 4000, attrited: (total + gap) / 2 },
    { randomized: 4000, attrited: (total - gap) / 2 },
  );
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
      expect(onCautious.cautious).toEqual({
        verdict: 'low-attrition',
        maxDifferentialPercent: cautious,
        overallPercentRow: row,
      });
      expect(onCautious.optimistic).toEqual({
        verdict: 'low-attrition',
        maxDifferentialPercent: optimistic,
        overallPercentRow: row,
      });

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
    expect(assessWwcPair({ randomized: 1000, attrited: 58 }, { randomized: 20000, attrited: 0 }).cautious.verdict).toBe(
      'high-attrition',
    );
    // 100 of 1,000: differential 10.0 points, overall 0.48 % → row 0, on the optimistic line; 101 is above it.
    expect(
      assessWwcPair({ randomized: 1000, attrited: 100 }, { randomized: 20000, attrited: 0 }).optimistic.verdict,
    ).toBe('low-attrition');
    expect(
      assessWwcPair({ randomized: 1000, attrited: 101 }, { randomized: 20000, attrited: 0 }).optimistic.verdict,
    ).toBe('high-attrition');
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

describe('the table row for an overall rate between two whole percents', () => {
  // Rule (see WWC_ROW_RULE): a whole-percent rate reads its own row; a rate between two rows is judged on the stricter
  // of the two, so no rate is ever judged more leniently than a row it sits next to.
  it('judges 28.4 % overall with 4.4 points differential on row 29 (4.3), not on row 28 (4.4) as half-up rounding did', () => {
    // 1,000 per condition: 306 and 262 attrited → overall 568 / 2,000 = 28.4 %, differential 4.4 points.
    const result = assessWwcPair({ randomized: 1000, attrited: 306 }, { randomized: 1000, attrited: 262 });
    expect(result.overallPercentRows).toEqual([28, 29]);
    expect(result.cautious).toEqual({ verdict: 'high-attrition', maxDifferentialPercent: 4.3, overallPercentRow: 29 });
  });

  it('judges 28.6 % with 4.4 points the same way (high on the cautious boundary), whichever way a reader would round', () => {
    const result = assessWwcPair({ randomized: 1000, attrited: 308 }, { randomized: 1000, attrited: 264 });
    expect(result.overallPercentRows).toEqual([28, 29]);
    expect(result.cautious.verdict).toBe('high-attrition');
  });

  it('uses the single row at an exact whole percent: 28.0 % with 4.4 points is low attrition (row 28, 4.4)', () => {
    const result = assessWwcPair({ randomized: 1000, attrited: 302 }, { randomized: 1000, attrited: 258 });
    expect(result.overallPercentRows).toEqual([28]);
    expect(result.cautious).toEqual({ verdict: 'low-attrition', maxDifferentialPercent: 4.4, overallPercentRow: 28 });
  });

  it('below 10 %, where the boundary rises with the overall rate, takes the lower row: 5.6 % reads row 5 (6.1), not 6 (6.2)', () => {
    // 1,000 per condition, 87 and 25 attrited → overall 112 / 2,000 = 5.6 %, differential 6.2 points.
    const result = assessWwcPair({ randomized: 1000, attrited: 87 }, { randomized: 1000, attrited: 25 });
    expect(result.cautious).toEqual({ verdict: 'high-attrition', maxDifferentialPercent: 6.1, overallPercentRow: 5 });
  });

  it('says "outside the published range" above 57 %, including any rate between 57 % and 58 %', () => {
    const justAbove = pair(1145, 1146); // 2,291 / 4,000 = 57.275 %: row 58 is not in the table
    expect(justAbove.cautious).toEqual({
      verdict: 'outside-published-range',
      maxDifferentialPercent: null,
      overallPercentRow: null,
    });
    expect(justAbove.optimistic.verdict).toBe('outside-published-range');
    // Exactly 57 %: row 57 (0.0 / 2.3); differential 0.1 points: above the cautious line, below the optimistic.
    const lastRow = pair(1139, 1141);
    expect(lastRow.overallPercentRows).toEqual([57]);
    expect([lastRow.cautious.verdict, lastRow.optimistic.verdict]).toEqual(['high-attrition', 'low-attrition']);
    expect(pair(1600, 1600).optimistic.verdict).toBe('outside-published-range'); // 80 %
  });

  it('is not computable when a condition has nobody whose window has ended', () => {
    const result = assessWwcPair({ randomized: 0, attrited: 0 }, { randomized: 10, attrited: 1 });
    expect(result.cautious.verdict).toBe('not-computable');
    expect(result.differentialAttritionRate).toBeNull();
  });
});

describe('every pair of three or more conditions', () => {
  it('finds the high-attrition pair that a comparison with the first condition would not show (20 %, 16 %, 24 %)', () => {
    const conditions = [
      { conditionId: 'audio', randomized: 100, attrited: 20 },
      { conditionId: 'map', randomized: 100, attrited: 16 },
      { conditionId: 'none', randomized: 100, attrited: 24 },
    ];
    const result = assessWwcAgainstComparison(conditions);
    // Against the first condition only: 18 % / 4 points and 22 % / 4 points, both within the cautious boundary.
    expect(result.pairs.map((p) => p.cautious.verdict)).toEqual(['low-attrition', 'low-attrition']);
    // map vs none: overall 40 / 200 = 20 % → row 20 (cautious 5.4, optimistic 10.2); differential 8 points.
    expect(result.allPairs).toHaveLength(3);
    expect(result.cautious).toBe('high-attrition');
    expect(result.optimistic).toBe('low-attrition');
    expect(result.worstPair.cautious).toMatchObject({
      conditionId: 'map',
      comparisonConditionId: 'none',
      overallPercentRows: [20],
    });
    expect(result.worstPair.cautious?.differentialAttritionRate).toBeCloseTo(0.08, 12);
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
    // turn-by-turn: overall 410 / 4,000 = 10.25 % → rows 10 and 11, the stricter 11 (6.2); differential 0.5 points → low under both.
    expect(result.pairs[0].overallPercentRow).toBe(11);
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
    expect(() => assessWwcAgainstComparison(conditions, 'compass')).toThrow(
      /comparisonConditionId: "compass" is not one of the study's conditions/,
    );
    expect(() => assessWwcAgainstComparison([conditions[0], conditions[0]])).toThrow(
      /conditions\[1\]\.conditionId: "landmarks" appears more than once/,
    );
  });

  it('is not computable with a single condition', () => {
    const result = assessWwcAgainstComparison([conditions[0]]);
    expect(result.pairs).toEqual([]);
    expect(result.cautious).toBe('not-computable');
  });
});
