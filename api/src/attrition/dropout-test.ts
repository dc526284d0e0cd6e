import { type ChiSquareResult, chiSquareIndependence, requireTable } from './chi-square';
import { type ExactTableTestResult, exactRowsByTwoTest } from './exact-table-test';
import { type FisherExactResult, fisherExact } from './fisher-exact';

export type DropoutTestMethod = 'chi-square' | 'fisher-exact' | 'freeman-halton-exact' | 'monte-carlo-exact';

/** Why the shown test was chosen: some expected count below 5 calls for an exact test (Cochran 1954). */
export type DropoutTestReason = 'small-expected-counts' | 'expected-counts-adequate' | 'not-computable';

/** The test shown on screen for condition × dropped / not dropped, with the details of every test computed. */
export interface DropoutTestSummary {
  method: DropoutTestMethod;
  reason: DropoutTestReason;
  /** The smallest expected cell count of the table; null when it cannot be formed. */
  smallestExpected: number | null;
  /** X² for the chi-square test; null for the exact tests, which have no statistic, or when not computable. */
  statistic: number | null;
  df: number | null;
  pValue: number | null;
  continuityCorrection: false;
  chiSquare: ChiSquareResult | null;
  /** Only for two conditions. */
  fisherExact: FisherExactResult | null;
  /** The exact r×2 test (Freeman–Halton, or its Monte Carlo estimate), computed whenever expected counts are small. */
  exact: ExactTableTestResult | null;
}

/** Rows are conditions: participants who dropped out and who did not (yet). */
export interface DropoutTableRow {
  dropped: number;
  notDropped: number;
}

// An exact test when any expected count is below 5 (Cochran 1954; common practice): Fisher's for a 2×2 table,
// Freeman–Halton (or its Monte Carlo estimate for very many tables) for three or more conditions; else chi-square.
export function chooseDropoutTest(observed: readonly (readonly number[])[], field = 'table'): DropoutTestMethod {
  requireTable(observed, field);
  if (!chiSquareIndependence(observed, field).smallExpectedCounts) return 'chi-square';
  return observed.length === 2 && observed[0].length === 2 ? 'fisher-exact' : 'freeman-halton-exact';
}

export function testDropoutByCondition(rows: readonly DropoutTableRow[], field = 'conditions'): DropoutTestSummary {
  const observed = rows.map((row) => [row.dropped, row.notDropped]);
  const withoutStatistic = { statistic: null, df: null, continuityCorrection: false as const };
  if (observed.length < 2) {
    return {
      method: 'chi-square',
      reason: 'not-computable',
      smallestExpected: null,
      ...withoutStatistic,
      pValue: null,
      chiSquare: null,
      fisherExact: null,
      exact: null,
    };
  }
  const chiSquare = chiSquareIndependence(observed, field);
  const smallestExpected = Math.min(...chiSquare.expected.flat());
  const fisher = observed.length === 2 ? fisherExact(observed, field) : null;
  const computable = chiSquare.statistic !== null;
  const choice = chooseDropoutTest(observed, field);
  const exact =
    computable && choice !== 'chi-square' && observed.length > 2 ? exactRowsByTwoTest(observed, {}, field) : null;
  const common = { smallestExpected, chiSquare, fisherExact: fisher, exact };
  if (!computable) {
    return { method: 'chi-square', reason: 'not-computable', ...withoutStatistic, pValue: null, ...common };
  }
  if (choice === 'fisher-exact' && fisher !== null) {
    return {
      method: 'fisher-exact',
      reason: 'small-expected-counts',
      ...withoutStatistic,
      pValue: fisher.pValueTwoSided,
      ...common,
    };
  }
  if (exact !== null) {
    return {
      method: exact.method,
      reason: 'small-expected-counts',
      ...withoutStatistic,
      pValue: exact.pValue,
      ...common,
    };
  }
  return {
    method: 'chi-square',
    reason: 'expected-counts-adequate',
    statistic: chiSquare.statistic,
    df: chiSquare.df,
    pValue: chiSquare.pValue,
    continuityCorrection: false,
    ...common,
  };
}
