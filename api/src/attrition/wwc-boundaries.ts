// WWC attrition boundaries, Procedures and Standards Handbook v4.0 (2017), unchanged in v4.1 and v5.0 (see data/README.md).
// Generated from data/wwc-attrition-boundaries.csv; wwc-boundaries.spec.ts asserts the rows equal the file.

/** Highest differential attrition (percentage points) still counted as low attrition at one whole-percent overall rate. */
export interface WwcBoundaryRow {
  overallAttritionPercent: number;
  maxDifferentialPercentCautious: number;
  maxDifferentialPercentOptimistic: number;
}

export const WWC_ATTRITION_BOUNDARIES: readonly WwcBoundaryRow[] = Object.freeze([
  { overallAttritionPercent: 0, maxDifferentialPercentCautious: 5.7, maxDifferentialPercentOptimistic: 10 },
  { overallAttritionPercent: 1, maxDifferentialPercentCautious: 5.8, maxDifferentialPercentOptimistic: 10.1 },
  { overallAttritionPercent: 2, maxDifferentialPercentCautious: 5.9, maxDifferentialPercentOptimistic: 10.2 },
  { overallAttritionPercent: 3, maxDifferentialPercentCautious: 5.9, maxDifferentialPercentOptimistic: 10.3 },
  { overallAttritionPercent: 4, maxDifferentialPercentCautious: 6, maxDifferentialPercentOptimistic: 10.4 },
  { overallAttritionPercent: 5, maxDifferentialPercentCautious: 6.1, maxDifferentialPercentOptimistic: 10.5 },
  { overallAttritionPercent: 6, maxDifferentialPercentCautious: 6.2, maxDifferentialPercentOptimistic: 10.7 },
  { overallAttritionPercent: 7, maxDifferentialPercentCautious: 6.3, maxDifferentialPercentOptimistic: 10.8 },
  { overallAttritionPercent: 8, maxDifferentialPercentCautious: 6.3, maxDifferentialPercentOptimistic: 10.9 },
  { overallAttritionPercent: 9, maxDifferentialPercentCautious: 6.3, maxDifferentialPercentOptimistic: 10.9 },
  { overallAttritionPercent: 10, maxDifferentialPercentCautious: 6.3, maxDifferentialPercentOptimistic: 10.9 },
  { overallAttritionPercent: 11, maxDifferentialPercentCautious: 6.2, maxDifferentialPercentOptimistic: 10.9 },
  { overallAttritionPercent: 12, maxDifferentialPercentCautious: 6.2, maxDifferentialPercentOptimistic: 10.9 },
  { overallAttritionPercent: 13, maxDifferentialPercentCautious: 6.1, maxDifferentialPercentOptimistic: 10.9 },
  { overallAttritionPercent: 14, maxDifferentialPercentCautious: 6, maxDifferentialPercentOptimistic: 10.8 },
  { overallAttritionPercent: 15, maxDifferentialPercentCautious: 5.9, maxDifferentialPercentOptimistic: 10.8 },
  { overallAttritionPercent: 16, maxDifferentialPercentCautious: 5.9, maxDifferentialPercentOptimistic: 10.7 },
  { overallAttritionPercent: 17, maxDifferentialPercentCautious: 5.8, maxDifferentialPercentOptimistic: 10.6 },
  { overallAttritionPercent: 18, maxDifferentialPercentCautious: 5.7, maxDifferentialPercentOptimistic: 10.5 },
  { overallAttritionPercent: 19, maxDifferentialPercentCautious: 5.5, maxDifferentialPercentOptimistic: 10.3 },
  { overallAttritionPercent: 20, maxDifferentialPercentCautious: 5.4, maxDifferentialPercentOptimistic: 10.2 },
  { overallAttritionPercent: 21, maxDifferentialPercentCautious: 5.3, maxDifferentialPercentOptimistic: 10 },
  { overallAttritionPercent: 22, maxDifferentialPercentCautious: 5.2, maxDifferentialPercentOptimistic: 9.9 },
  { overallAttritionPercent: 23, maxDifferentialPercentCautious: 5.1, maxDifferentialPercentOptimistic: 9.7 },
  { overallAttritionPercent: 24, maxDifferentialPercentCautious: 4.9, maxDifferentialPercentOptimistic: 9.5 },
  { overallAttritionPercent: 25, maxDifferentialPercentCautious: 4.8, maxDifferentialPercentOptimistic: 9.4 },
  { overallAttritionPercent: 26, maxDifferentialPercentCautious: 4.7, maxDifferentialPercentOptimistic: 9.2 },
  { overallAttritionPercent: 27, maxDifferentialPercentCautious: 4.5, maxDifferentialPercentOptimistic: 9 },
  { overallAttritionPercent: 28, maxDifferentialPercentCautious: 4.4, maxDifferentialPercentOptimistic: 8.8 },
  { overallAttritionPercent: 29, maxDifferentialPercentCautious: 4.3, maxDifferentialPercentOptimistic: 8.6 },
  { overallAttritionPercent: 30, maxDifferentialPercentCautious: 4.1, maxDifferentialPercentOptimistic: 8.4 },
  { overallAttritionPercent: 31, maxDifferentialPercentCautious: 4, maxDifferentialPercentOptimistic: 8.2 },
  { overallAttritionPercent: 32, maxDifferentialPercentCautious: 3.8, maxDifferentialPercentOptimistic: 8 },
  { overallAttritionPercent: 33, maxDifferentialPercentCautious: 3.6, maxDifferentialPercentOptimistic: 7.8 },
  { overallAttritionPercent: 34, maxDifferentialPercentCautious: 3.5, maxDifferentialPercentOptimistic: 7.6 },
  { overallAttritionPercent: 35, maxDifferentialPercentCautious: 3.3, maxDifferentialPercentOptimistic: 7.4 },
  { overallAttritionPercent: 36, maxDifferentialPercentCautious: 3.2, maxDifferentialPercentOptimistic: 7.2 },
  { overallAttritionPercent: 37, maxDifferentialPercentCautious: 3.1, maxDifferentialPercentOptimistic: 7 },
  { overallAttritionPercent: 38, maxDifferentialPercentCautious: 2.9, maxDifferentialPercentOptimistic: 6.7 },
  { overallAttritionPercent: 39, maxDifferentialPercentCautious: 2.8, maxDifferentialPercentOptimistic: 6.5 },
  { overallAttritionPercent: 40, maxDifferentialPercentCautious: 2.6, maxDifferentialPercentOptimistic: 6.3 },
  { overallAttritionPercent: 41, maxDifferentialPercentCautious: 2.5, maxDifferentialPercentOptimistic: 6 },
  { overallAttritionPercent: 42, maxDifferentialPercentCautious: 2.3, maxDifferentialPercentOptimistic: 5.8 },
  { overallAttritionPercent: 43, maxDifferentialPercentCautious: 2.1, maxDifferentialPercentOptimistic: 5.6 },
  { overallAttritionPercent: 44, maxDifferentialPercentCautious: 2, maxDifferentialPercentOptimistic: 5.3 },
  { overallAttritionPercent: 45, maxDifferentialPercentCautious: 1.8, maxDifferentialPercentOptimistic: 5.1 },
  { overallAttritionPercent: 46, maxDifferentialPercentCautious: 1.6, maxDifferentialPercentOptimistic: 4.9 },
  { overallAttritionPercent: 47, maxDifferentialPercentCautious: 1.5, maxDifferentialPercentOptimistic: 4.6 },
  { overallAttritionPercent: 48, maxDifferentialPercentCautious: 1.3, maxDifferentialPercentOptimistic: 4.4 },
  { overallAttritionPercent: 49, maxDifferentialPercentCautious: 1.2, maxDifferentialPercentOptimistic: 4.2 },
  { overallAttritionPercent: 50, maxDifferentialPercentCautious: 1, maxDifferentialPercentOptimistic: 3.9 },
  { overallAttritionPercent: 51, maxDifferentialPercentCautious: 0.9, maxDifferentialPercentOptimistic: 3.7 },
  { overallAttritionPercent: 52, maxDifferentialPercentCautious: 0.7, maxDifferentialPercentOptimistic: 3.5 },
  { overallAttritionPercent: 53, maxDifferentialPercentCautious: 0.6, maxDifferentialPercentOptimistic: 3.2 },
  { overallAttritionPercent: 54, maxDifferentialPercentCautious: 0.4, maxDifferentialPercentOptimistic: 3 },
  { overallAttritionPercent: 55, maxDifferentialPercentCautious: 0.3, maxDifferentialPercentOptimistic: 2.8 },
  { overallAttritionPercent: 56, maxDifferentialPercentCautious: 0.2, maxDifferentialPercentOptimistic: 2.6 },
  { overallAttritionPercent: 57, maxDifferentialPercentCautious: 0, maxDifferentialPercentOptimistic: 2.3 },
]);

/** The last overall rate the published table covers; above it the verdict is "outside the published range". */
export const WWC_HIGHEST_TABULATED_OVERALL_PERCENT = 57;

export function wwcBoundaryRow(overallAttritionPercent: number): WwcBoundaryRow | null {
  return WWC_ATTRITION_BOUNDARIES.find((row) => row.overallAttritionPercent === overallAttritionPercent) ?? null;
}
