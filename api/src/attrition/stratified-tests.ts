import { jStat } from 'jstat';
import { AttritionInputError, requireCount } from './attrition-input-error';
import { requireConditionIds } from './attrition-rates';
import { type LogRankComponents, type SurvivalGroup, logRankComponents, logRankQuadraticForm } from './log-rank';

/** One stratum's table: per condition, how many were randomized and how many dropped out. */
export interface StratumCounts {
  stratum: string;
  conditions: readonly { randomized: number; dropped: number }[];
}

export interface StratifiedTestResult {
  method: 'cochran-mantel-haenszel';
  statistic: number | null;
  df: number;
  pValue: number | null;
  /** Strata that carried information (someone dropped out and someone did not, in two or more conditions). */
  strataUsed: number;
}

/**
 * Generalized Cochran–Mantel–Haenszel test of condition × dropout across strata (Mantel & Haenszel 1959; Landis,
 * Heyman & Koch 1978, general association for an r×2 table per stratum), no continuity correction: within a stratum
 * the dropouts per condition are multivariate hypergeometric given the margins, E x_i = n_i m / N and
 * Cov(x_i, x_j) = m (N − m) / (N² (N − 1)) · n_i (N δ_ij − n_j); U = Σ (x − E) and V = Σ Cov over strata, one
 * condition left out, X² = U′V⁻¹U on r − 1 df. With one stratum it is (N − 1)/N times Pearson's X².
 */
export function cochranMantelHaenszel(strata: readonly StratumCounts[], field = 'strata'): StratifiedTestResult {
  const r = strata[0]?.conditions.length ?? 0;
  const u = new Array<number>(r).fill(0);
  const v = Array.from({ length: r }, () => new Array<number>(r).fill(0));
  let strataUsed = 0;
  strata.forEach((stratum, s) => {
    if (stratum.conditions.length !== r)
      throw new AttritionInputError(`${field}[${s}].conditions`, `must list ${r} conditions`);
    const n = stratum.conditions.map((c, i) => {
      requireCount(c.randomized, `${field}[${s}].conditions[${i}].randomized`);
      requireCount(c.dropped, `${field}[${s}].conditions[${i}].dropped`);
      if (c.dropped > c.randomized)
        throw new AttritionInputError(`${field}[${s}].conditions[${i}].dropped`, 'must not exceed randomized');
      return c.randomized;
    });
    const total = n.reduce((sum, value) => sum + value, 0);
    const dropped = stratum.conditions.reduce((sum, c) => sum + c.dropped, 0);
    if (total < 2 || dropped === 0 || dropped === total || n.filter((value) => value > 0).length < 2) return;
    strataUsed += 1;
    const spread = (dropped * (total - dropped)) / (total * total * (total - 1));
    for (let i = 0; i < r; i += 1) {
      u[i] += stratum.conditions[i].dropped - (n[i] * dropped) / total;
      for (let j = 0; j < r; j += 1) v[i][j] += spread * n[i] * ((i === j ? total : 0) - n[j]);
    }
  });
  const informative = v.map((row, i) => (row[i] > 0 ? i : -1)).filter((i) => i >= 0);
  const df = Math.max(0, informative.length - 1);
  if (informative.length < 2)
    return { method: 'cochran-mantel-haenszel', statistic: null, df, pValue: null, strataUsed };
  const kept = informative.slice(0, -1);
  const solution = solve(
    kept.map((i) => kept.map((j) => v[i][j])),
    kept.map((i) => u[i]),
  );
  if (solution === null) return { method: 'cochran-mantel-haenszel', statistic: null, df, pValue: null, strataUsed };
  const statistic = Math.max(
    0,
    kept.reduce((sum, i, index) => sum + u[i] * solution[index], 0),
  );
  return {
    method: 'cochran-mantel-haenszel',
    statistic,
    df,
    pValue: Math.min(1, Math.max(0, 1 - jStat.chisquare.cdf(statistic, df))),
    strataUsed,
  };
}

function solve(matrix: number[][], vector: number[]): number[] | null {
  const size = vector.length;
  const rows = matrix.map((row, i) => [...row, vector[i]]);
  for (let column = 0; column < size; column += 1) {
    let pivot = column;
    for (let row = column + 1; row < size; row += 1)
      if (Math.abs(rows[row][column]) > Math.abs(rows[pivot][column])) pivot = row;
    if (Math.abs(rows[pivot][column]) < 1e-12) return null;
    [rows[column], rows[pivot]] = [rows[pivot], rows[column]];
    for (let row = 0; row < size; row += 1) {
      if (row === column) continue;
      const factor = rows[row][column] / rows[column][column];
      for (let entry = column; entry <= size; entry += 1) rows[row][entry] -= factor * rows[column][entry];
    }
  }
  return rows.map((row, i) => row[size] / row[i]);
}

/** One stratum's follow-up per condition (every stratum lists the same conditions, in the same order). */
export interface StratumSurvival {
  stratum: string;
  groups: readonly SurvivalGroup[];
}

export interface StratifiedLogRankResult {
  method: 'stratified-log-rank';
  statistic: number | null;
  df: number;
  pValue: number | null;
  /** Observed and expected dropouts per condition, summed over strata. */
  groups: { conditionId: string; observed: number; expected: number }[];
  /** Strata in which someone dropped out. */
  strataUsed: number;
}

/**
 * Stratified log-rank test (Kalbfleisch & Prentice 1980, §7.4; R survival::survdiff with strata()): O − E and its
 * variance-covariance are computed within each stratum, each stratum with its own risk sets, then summed; X² = U′V⁻¹U
 * on the conditions with any expected dropout, one left out. With one stratum it is the ordinary log-rank test.
 */
export function stratifiedLogRank(strata: readonly StratumSurvival[], field = 'strata'): StratifiedLogRankResult {
  const ids = strata[0]?.groups.map((group) => group.conditionId) ?? [];
  requireConditionIds(ids, `${field}[0].groups`);
  const k = ids.length;
  const total: LogRankComponents = {
    observed: new Array<number>(k).fill(0),
    expected: new Array<number>(k).fill(0),
    covariance: Array.from({ length: k }, () => new Array<number>(k).fill(0)),
  };
  let strataUsed = 0;
  strata.forEach((stratum, s) => {
    const here = stratum.groups.map((group) => group.conditionId);
    if (here.length !== k || here.some((id, i) => id !== ids[i])) {
      throw new AttritionInputError(
        `${field}[${s}].groups`,
        `must list the conditions ${ids.join(', ')} in that order`,
      );
    }
    const part = logRankComponents(stratum.groups, `${field}[${s}].groups`);
    if (part.observed.some((value) => value > 0)) strataUsed += 1;
    for (let j = 0; j < k; j += 1) {
      total.observed[j] += part.observed[j];
      total.expected[j] += part.expected[j];
      for (let l = 0; l < k; l += 1) total.covariance[j][l] += part.covariance[j][l];
    }
  });
  return {
    method: 'stratified-log-rank',
    ...logRankQuadraticForm(total),
    groups: ids.map((conditionId, g) => ({ conditionId, observed: total.observed[g], expected: total.expected[g] })),
    strataUsed,
  };
}
