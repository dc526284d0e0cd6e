import { jStat } from 'jstat';
import { requireConditionIds } from './attrition-rates';
import { type SurvivalTimeCount, normalizeSurvivalCounts } from './kaplan-meier';

export interface SurvivalGroup {
  conditionId: string;
  counts: readonly SurvivalTimeCount[];
}

export interface LogRankResult {
  method: 'log-rank';
  /** U′ V⁻¹ U over the conditions with any expected dropout; null when fewer than two such conditions or V is singular. */
  statistic: number | null;
  df: number;
  pValue: number | null;
  groups: { conditionId: string; observed: number; expected: number }[];
}

// Log-rank test across k conditions (Mantel 1966; Peto & Peto 1972): at each dropout time E_j += d·n_j/n and
// V_jl += d·(n − d)/(n − 1) · (n_j/n)·(δ_jl − n_l/n); X² = U′V⁻¹U on k − 1 df with U = O − E, one condition left out.
export function logRankTest(groups: readonly SurvivalGroup[], field = 'groups'): LogRankResult {
  requireConditionIds(
    groups.map((group) => group.conditionId),
    field,
  );
  const series = groups.map((group, g) => normalizeSurvivalCounts(group.counts, `${field}[${g}].counts`));
  const k = groups.length;
  const atRisk = series.map((counts) => counts.reduce((total, count) => total + count.dropped + count.censored, 0));
  const observed = series.map((counts) => counts.reduce((total, count) => total + count.dropped, 0));
  const expected = new Array<number>(k).fill(0);
  const covariance = Array.from({ length: k }, () => new Array<number>(k).fill(0));

  const times = [...new Set(series.flatMap((counts) => counts.map((count) => count.time)))].sort((x, y) => x - y);
  const cursor = new Array<number>(k).fill(0);
  for (const time of times) {
    const here = series.map((counts, g) => {
      const count = counts[cursor[g]];
      if (count === undefined || count.time !== time) return { dropped: 0, censored: 0 };
      cursor[g] += 1;
      return count;
    });
    const n = atRisk.reduce((total, value) => total + value, 0);
    const d = here.reduce((total, count) => total + count.dropped, 0);
    if (d > 0 && n > 0) {
      const spread = n > 1 ? (d * (n - d)) / (n - 1) : 0;
      for (let j = 0; j < k; j += 1) {
        expected[j] += (d * atRisk[j]) / n;
        for (let l = 0; l < k; l += 1) {
          covariance[j][l] += spread * (atRisk[j] / n) * ((j === l ? 1 : 0) - atRisk[l] / n);
        }
      }
    }
    here.forEach((count, g) => {
      atRisk[g] -= count.dropped + count.censored;
    });
  }

  const resultGroups = groups.map((group, g) => ({ conditionId: group.conditionId, observed: observed[g], expected: expected[g] }));
  // As R's survdiff: conditions with no expected dropout carry no information and do not count towards the df.
  const informative = expected.map((value, g) => (value > 0 ? g : -1)).filter((g) => g >= 0);
  const df = Math.max(0, informative.length - 1);
  if (informative.length < 2) return { method: 'log-rank', statistic: null, df, pValue: null, groups: resultGroups };

  const kept = informative.slice(0, -1);
  const u = kept.map((g) => observed[g] - expected[g]);
  const v = kept.map((j) => kept.map((l) => covariance[j][l]));
  const solution = solveLinearSystem(v, u);
  if (solution === null) return { method: 'log-rank', statistic: null, df, pValue: null, groups: resultGroups };
  const statistic = Math.max(
    0,
    u.reduce((total, value, i) => total + value * solution[i], 0),
  );
  const pValue = Math.min(1, Math.max(0, 1 - jStat.chisquare.cdf(statistic, df)));
  return { method: 'log-rank', statistic, df, pValue, groups: resultGroups };
}

/** Gaussian elimination with partial pivoting; null when the matrix is numerically singular. */
function solveLinearSystem(matrix: number[][], vector: number[]): number[] | null {
  const size = vector.length;
  const rows = matrix.map((row, i) => [...row, vector[i]]);
  const scale = Math.max(...matrix.map((row, i) => Math.abs(row[i])));
  if (!(scale > 0)) return null;
  for (let column = 0; column < size; column += 1) {
    let pivot = column;
    for (let row = column + 1; row < size; row += 1) {
      if (Math.abs(rows[row][column]) > Math.abs(rows[pivot][column])) pivot = row;
    }
    if (Math.abs(rows[pivot][column]) <= scale * 1e-12) return null;
    [rows[column], rows[pivot]] = [rows[pivot], rows[column]];
    for (let row = 0; row < size; row += 1) {
      if (row === column) continue;
      const factor = rows[row][column] / rows[column][column];
      for (let entry = column; entry <= size; entry += 1) rows[row][entry] -= factor * rows[column][entry];
    }
  }
  return rows.map((row, i) => row[size] / row[i]);
}
