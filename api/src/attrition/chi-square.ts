import { jStat } from 'jstat';
import { AttritionInputError, requireCount } from './attrition-input-error';

export interface ChiSquareResult {
  method: 'chi-square';
  /** Pearson's X²; null when a row or column total is zero (the expected counts would divide by zero). */
  statistic: number | null;
  df: number;
  pValue: number | null;
  expected: number[][];
  /** Never applied (no Yates correction), so the screen can say so. */
  continuityCorrection: false;
  /** Any expected count below 5, where the chi-square approximation is doubtful (Cochran 1954, common practice). */
  smallExpectedCounts: boolean;
}

export function requireTable(observed: readonly (readonly number[])[], field: string): void {
  if (observed.length < 2) throw new AttritionInputError(field, 'needs at least two rows');
  const columns = observed[0]?.length ?? 0;
  if (columns < 2) throw new AttritionInputError(`${field}[0]`, 'needs at least two columns');
  observed.forEach((row, i) => {
    if (row.length !== columns)
      throw new AttritionInputError(`${field}[${i}]`, `has ${row.length} cells, expected ${columns}`);
    row.forEach((cell, j) => requireCount(cell, `${field}[${i}][${j}]`));
  });
}

// Pearson's chi-square test of independence for an r×c table, X² = Σ (O − E)² / E with E = row total × column total / N,
// on (r − 1)(c − 1) df, no continuity correction (Agresti 2007, An Introduction to Categorical Data Analysis, §2.4).
export function chiSquareIndependence(observed: readonly (readonly number[])[], field = 'table'): ChiSquareResult {
  requireTable(observed, field);
  const rowTotals = observed.map((row) => row.reduce((sum, cell) => sum + cell, 0));
  const columnTotals = observed[0].map((_, j) => observed.reduce((sum, row) => sum + row[j], 0));
  const total = rowTotals.reduce((sum, value) => sum + value, 0);
  const expected = rowTotals.map((rowTotal) =>
    columnTotals.map((columnTotal) => (total === 0 ? 0 : (rowTotal * columnTotal) / total)),
  );
  const df = (observed.length - 1) * (columnTotals.length - 1);
  const smallExpectedCounts = expected.some((row) => row.some((cell) => cell < 5));
  const base = {
    method: 'chi-square' as const,
    df,
    expected,
    continuityCorrection: false as const,
    smallExpectedCounts,
  };
  if (rowTotals.includes(0) || columnTotals.includes(0)) return { ...base, statistic: null, pValue: null };

  let statistic = 0;
  observed.forEach((row, i) =>
    row.forEach((cell, j) => {
      statistic += (cell - expected[i][j]) ** 2 / expected[i][j];
    }),
  );
  const pValue = Math.min(1, Math.max(0, 1 - jStat.chisquare.cdf(statistic, df)));
  return { ...base, statistic, pValue };
}
