import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { WWC_ATTRITION_BOUNDARIES, WWC_HIGHEST_TABULATED_OVERALL_PERCENT, wwcBoundaryRow } from './wwc-boundaries';

describe('WWC attrition boundary table', () => {
  it('holds exactly the rows of data/wwc-attrition-boundaries.csv', () => {
    // Source: WWC Procedures and Standards Handbook v4.0 (2017) attrition boundary table, as shipped in data/.
    const [header, ...lines] = readFileSync(join(__dirname, 'data', 'wwc-attrition-boundaries.csv'), 'utf8')
      .trim()
      .split(/\r?\n/);
    expect(header).toBe('overall_attrition_pct,max_differential_pct_cautious,max_differential_pct_optimistic');
    const fromCsv = lines.map((line) => {
      const cells = line.split(',');
      expect(cells).toHaveLength(3);
      const [overall, cautious, optimistic] = cells.map(Number);
      return {
        overallAttritionPercent: overall,
        maxDifferentialPercentCautious: cautious,
        maxDifferentialPercentOptimistic: optimistic,
      };
    });
    expect(WWC_ATTRITION_BOUNDARIES).toEqual(fromCsv);
  });

  it('covers every whole percent from 0 to 57 and nothing above', () => {
    expect(WWC_ATTRITION_BOUNDARIES.map((row) => row.overallAttritionPercent)).toEqual(
      Array.from({ length: 58 }, (_, i) => i),
    );
    expect(WWC_HIGHEST_TABULATED_OVERALL_PERCENT).toBe(57);
    expect(wwcBoundaryRow(58)).toBeNull();
    // Source: the handbook table (data/README.md): the cautious boundary peaks at 6.3 (overall 7–10 %) and reaches 0 at 57 %.
    expect(wwcBoundaryRow(10)).toEqual({
      overallAttritionPercent: 10,
      maxDifferentialPercentCautious: 6.3,
      maxDifferentialPercentOptimistic: 10.9,
    });
    expect(wwcBoundaryRow(57)).toEqual({
      overallAttritionPercent: 57,
      maxDifferentialPercentCautious: 0,
      maxDifferentialPercentOptimistic: 2.3,
    });
  });
});
