import { type ChiSquareResult, chiSquareIndependence, requireTable } from './chi-square';
import { type FisherExactResult, fisherExact } from './fisher-exact';

export type DropoutTestMethod = 'chi-square' | 'fisher-exact';

/** The test shown on screen for condition × dropped / not dropped, with the details of both where they apply. */
export interface DropoutTestSummary {
  method: DropoutTestMethod;
  /** X² for the chi-square test; null for Fisher's exact test, which has no statistic, or when not computable. */
  statistic: number | null;
  df: number | null;
  pValue: number | null;
  continuityCorrection: false;
  chiSquare: ChiSquareResult | null;
  /** Only for two conditions. */
  fisherExact: FisherExactResult | null;
}

/** Rows are conditions: participants who dropped out and who did not (yet). */
export interface DropoutTableRow {
  dropped: number;
  notDropped: number;
}

// Fisher's exact test when a 2×2 table has any expected count below 5, else chi-square (Cochran 1954; common practice).
export function chooseDropoutTest(observed: readonly (readonly number[])[], field = 'table'): DropoutTestMethod {
  requireTable(observed, field);
  const isTwoByTwo = observed.length === 2 && observed[0].length === 2;
  return isTwoByTwo && chiSquareIndependence(observed, field).smallExpectedCounts ? 'fisher-exact' : 'chi-square';
}

export function testDropoutByCondition(rows: readonly DropoutTableRow[], field = 'conditions'): DropoutTestSummary {
  const observed = rows.map((row) => [row.dropped, row.notDropped]);
  const withoutStatistic = { statistic: null, df: null, continuityCorrection: false as const };
  if (observed.length < 2) {
    return { method: 'chi-square', ...withoutStatistic, pValue: null, chiSquare: null, fisherExact: null };
  }
  const chiSquare = chiSquareIndependence(observed, field);
  const fisher = observed.length === 2 ? fisherExact(observed, field) : null;
  if (chooseDropoutTest(observed, field) === 'fisher-exact' && fisher !== null) {
    return { method: 'fisher-exact', ...withoutStatistic, pValue: fisher.pValueTwoSided, chiSquare, fisherExact: fisher };
  }
  return {
    method: 'chi-square',
    statistic: chiSquare.statistic,
    df: chiSquare.df,
    pValue: chiSquare.pValue,
    continuityCorrection: false,
    chiSquare,
    fisherExact: fisher,
  };
}
