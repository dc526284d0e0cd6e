import { jStat } from 'jstat';
import seedrandom from 'seedrandom';
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
  /** Some condition expects fewer than 5 dropouts: the chi-square approximation is doubtful (as Cochran's rule for tables). */
  fewEvents: boolean;
  /** With few events, a seeded Monte Carlo permutation test of the same statistic; null when not run (see reason). */
  permutation: LogRankPermutation | null;
  /** Why no permutation test was run although events are few: too many people to relabel on every report. */
  permutationSkipped: 'too-many-participants' | null;
}

export interface LogRankPermutation {
  /** (1 + relabelings at least as extreme) / (B + 1). */
  pValue: number;
  replicates: number;
  /** √(p(1 − p) / B). */
  standardError: number;
  seed: string;
}

/** Relabelling costs a pass over everyone per replicate; beyond this many people the report only warns. */
export const PERMUTATION_MAX_PARTICIPANTS = 5000;
export const PERMUTATION_REPLICATES = 2000;
const PERMUTATION_SEED = 'evenhand-log-rank-permutation';
const FEW_EXPECTED_EVENTS = 5;

// Log-rank test across k conditions (Mantel 1966; Peto & Peto 1972): at each dropout time E_j += d·n_j/n and
// V_jl += d·(n − d)/(n − 1) · (n_j/n)·(δ_jl − n_l/n); X² = U′V⁻¹U on k − 1 df with U = O − E, one condition left out.
export function logRankTest(groups: readonly SurvivalGroup[], field = 'groups'): LogRankResult {
  const core = logRankCore(groups, field);
  const informative = core.groups.filter((group) => group.expected > 0);
  const fewEvents = informative.length >= 2 && informative.some((group) => group.expected < FEW_EXPECTED_EVENTS);
  const participants = groups.reduce(
    (total, group) => total + group.counts.reduce((sum, count) => sum + count.dropped + count.censored, 0),
    0,
  );
  const tooMany = participants > PERMUTATION_MAX_PARTICIPANTS;
  const permutation =
    fewEvents && !tooMany && core.statistic !== null ? permutationLogRank(groups, core.statistic, field) : null;
  return { ...core, fewEvents, permutation, permutationSkipped: fewEvents && tooMany ? 'too-many-participants' : null };
}

/**
 * Permutation test of the log-rank statistic (Peto & Peto 1972 discuss its permutational form): the condition labels
 * of the randomized people are shuffled among them with the follow-ups kept, as re-randomization would, and the
 * share of shuffles with X² at least the observed one is the p-value. Seeded, so a report is reproducible.
 */
export function permutationLogRank(
  groups: readonly SurvivalGroup[],
  observedStatistic: number,
  field = 'groups',
  replicates = PERMUTATION_REPLICATES,
  seed = PERMUTATION_SEED,
): LogRankPermutation {
  const series = groups.map((group, g) => normalizeSurvivalCounts(group.counts, `${field}[${g}].counts`));
  const times = [...new Set(series.flatMap((counts) => counts.map((count) => count.time)))].sort((x, y) => x - y);
  const timeIndex = new Map(times.map((time, index) => [time, index]));
  const people: { time: number; dropped: boolean }[] = [];
  const labels: number[] = [];
  series.forEach((counts, g) =>
    counts.forEach((count) => {
      for (let i = 0; i < count.dropped + count.censored; i += 1) {
        people.push({ time: timeIndex.get(count.time) as number, dropped: i < count.dropped });
        labels.push(g);
      }
    }),
  );
  const random = seedrandom.alea(seed);
  const k = groups.length;
  const steps = times.length;
  const dropped = new Int32Array(k * steps);
  const censored = new Int32Array(k * steps);
  let extreme = 0;
  for (let b = 0; b < replicates; b += 1) {
    for (let i = labels.length - 1; i > 0; i -= 1) {
      const j = Math.floor(random() * (i + 1));
      const swap = labels[i];
      labels[i] = labels[j];
      labels[j] = swap;
    }
    dropped.fill(0);
    censored.fill(0);
    for (let i = 0; i < people.length; i += 1) {
      const cell = labels[i] * steps + people[i].time;
      if (people[i].dropped) dropped[cell] += 1;
      else censored[cell] += 1;
    }
    const statistic = statisticOf(k, steps, dropped, censored);
    if (statistic !== null && statistic >= observedStatistic * (1 - 1e-9)) extreme += 1;
  }
  const pValue = (1 + extreme) / (replicates + 1);
  return { pValue, replicates, standardError: Math.sqrt((pValue * (1 - pValue)) / replicates), seed };
}

/** X² from per-condition dropped and censored counts (condition-major, one column per time), the same formula as logRankCore. */
function statisticOf(k: number, steps: number, dropped: Int32Array, censored: Int32Array): number | null {
  const atRisk = new Array<number>(k).fill(0);
  const observed = new Array<number>(k).fill(0);
  for (let g = 0; g < k; g += 1) {
    for (let t = 0; t < steps; t += 1) {
      atRisk[g] += dropped[g * steps + t] + censored[g * steps + t];
      observed[g] += dropped[g * steps + t];
    }
  }
  const expected = new Array<number>(k).fill(0);
  const covariance = Array.from({ length: k }, () => new Array<number>(k).fill(0));
  for (let t = 0; t < steps; t += 1) {
    let n = 0;
    let d = 0;
    for (let g = 0; g < k; g += 1) {
      n += atRisk[g];
      d += dropped[g * steps + t];
    }
    if (d > 0 && n > 0) {
      const spread = n > 1 ? (d * (n - d)) / (n - 1) : 0;
      for (let j = 0; j < k; j += 1) {
        expected[j] += (d * atRisk[j]) / n;
        for (let l = 0; l < k; l += 1)
          covariance[j][l] += spread * (atRisk[j] / n) * ((j === l ? 1 : 0) - atRisk[l] / n);
      }
    }
    for (let g = 0; g < k; g += 1) atRisk[g] -= dropped[g * steps + t] + censored[g * steps + t];
  }
  const informative = expected.map((value, g) => (value > 0 ? g : -1)).filter((g) => g >= 0);
  if (informative.length < 2) return null;
  const kept = informative.slice(0, -1);
  const u = kept.map((g) => observed[g] - expected[g]);
  const solution = solveLinearSystem(
    kept.map((j) => kept.map((l) => covariance[j][l])),
    u,
  );
  return solution === null
    ? null
    : Math.max(
        0,
        u.reduce((total, value, i) => total + value * solution[i], 0),
      );
}

/** Observed and expected dropouts per condition and the variance-covariance of O − E, summed over dropout times. */
export interface LogRankComponents {
  observed: number[];
  expected: number[];
  covariance: number[][];
}

export function logRankComponents(groups: readonly SurvivalGroup[], field = 'groups'): LogRankComponents {
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
  return { observed, expected, covariance };
}

/** U′V⁻¹U on the conditions with any expected dropout, one left out (as R's survdiff); null statistic when not computable. */
export function logRankQuadraticForm({ observed, expected, covariance }: LogRankComponents): {
  statistic: number | null;
  df: number;
  pValue: number | null;
} {
  const informative = expected.map((value, g) => (value > 0 ? g : -1)).filter((g) => g >= 0);
  const df = Math.max(0, informative.length - 1);
  if (informative.length < 2) return { statistic: null, df, pValue: null };
  const kept = informative.slice(0, -1);
  const u = kept.map((g) => observed[g] - expected[g]);
  const v = kept.map((j) => kept.map((l) => covariance[j][l]));
  const solution = solveLinearSystem(v, u);
  if (solution === null) return { statistic: null, df, pValue: null };
  const statistic = Math.max(
    0,
    u.reduce((total, value, i) => total + value * solution[i], 0),
  );
  return { statistic, df, pValue: Math.min(1, Math.max(0, 1 - jStat.chisquare.cdf(statistic, df))) };
}

function logRankCore(
  groups: readonly SurvivalGroup[],
  field: string,
): Omit<LogRankResult, 'fewEvents' | 'permutation' | 'permutationSkipped'> {
  requireConditionIds(
    groups.map((group) => group.conditionId),
    field,
  );
  const components = logRankComponents(groups, field);
  const resultGroups = groups.map((group, g) => ({
    conditionId: group.conditionId,
    observed: components.observed[g],
    expected: components.expected[g],
  }));
  // As R's survdiff: conditions with no expected dropout carry no information and do not count towards the df.
  return { method: 'log-rank', ...logRankQuadraticForm(components), groups: resultGroups };
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
