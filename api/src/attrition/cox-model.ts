import { jStat } from 'jstat';
import { AttritionInputError } from './attrition-input-error';
import { requireConditionIds } from './attrition-rates';
import { normalizeSurvivalCounts } from './kaplan-meier';
import type { SurvivalGroup } from './log-rank';

export type CoxTies = 'efron' | 'breslow';

export type HazardRatioNotEstimable =
  'nobody-randomized' | 'no-dropouts' | 'comparison-has-no-dropouts' | 'did-not-converge' | 'infinite-estimate';

/** Beyond these the partial likelihood is monotone (the estimate runs off to ±∞), as coxph warns "coefficient may be infinite". */
const LARGEST_COEFFICIENT = 15;
const LARGEST_STANDARD_ERROR = 50;

export interface HazardRatio {
  conditionId: string;
  /** log hazard ratio against the comparison condition; null when not estimable (see notEstimable). */
  coefficient: number | null;
  standardError: number | null;
  hazardRatio: number | null;
  lower: number | null;
  upper: number | null;
  /** Wald test of coefficient = 0. */
  pValue: number | null;
  notEstimable: HazardRatioNotEstimable | null;
}

export interface CoxModelResult {
  method: 'cox-proportional-hazards';
  ties: CoxTies;
  comparisonConditionId: string;
  confidenceLevel: number;
  /** One per condition other than the comparison, in the order given. */
  hazardRatios: HazardRatio[];
  iterations: number;
  converged: boolean;
  /** Log partial likelihood at the estimate; null when nothing was fitted. */
  logLikelihood: number | null;
}

const MAX_ITERATIONS = 30;
const TOLERANCE = 1e-9;

interface TimeSlice {
  dropped: number[];
  censored: number[];
}

/**
 * Cox proportional-hazards model of time to dropout with one indicator per condition against the comparison
 * condition (Cox 1972), fitted by Newton–Raphson on the log partial likelihood with step halving, as R's coxph
 * (same convergence rule: relative change in the log likelihood below 1e-9). Tied dropout times use Efron's
 * approximation by default (Efron 1977; R's default), or Breslow's (1974). Each risk set needs only the number at
 * risk and dropping out per condition, so the model is fitted from the same counts per time as the curves.
 * Intervals are Wald intervals on the log scale: exp(β ± z·SE), SE from the inverse observed information.
 * Conditions without any dropout have a hazard ratio of 0 with no finite estimate: they are reported as not
 * estimable and left out of the fit (their members would drop out of every risk set as β → −∞); so is a condition whose
 * likelihood keeps rising towards ±∞ (e.g. nobody in it drops out while the comparison is still at risk).
 */
export function coxProportionalHazards(
  groups: readonly SurvivalGroup[],
  comparisonConditionId: string,
  options: { ties?: CoxTies; confidenceLevel?: number } = {},
  field = 'groups',
): CoxModelResult {
  const ties = options.ties ?? 'efron';
  const confidenceLevel = options.confidenceLevel ?? 0.95;
  if (ties !== 'efron' && ties !== 'breslow') throw new AttritionInputError('ties', 'must be "efron" or "breslow"');
  requireConditionIds(
    groups.map((group) => group.conditionId),
    field,
  );
  const comparisonIndex = groups.findIndex((group) => group.conditionId === comparisonConditionId);
  if (comparisonIndex < 0)
    throw new AttritionInputError('comparisonConditionId', `"${comparisonConditionId}" is not one of the groups`);
  const series = groups.map((group, g) => normalizeSurvivalCounts(group.counts, `${field}[${g}].counts`));
  const people = series.map((counts) => counts.reduce((sum, count) => sum + count.dropped + count.censored, 0));
  const events = series.map((counts) => counts.reduce((sum, count) => sum + count.dropped, 0));

  const base = { method: 'cox-proportional-hazards' as const, ties, comparisonConditionId, confidenceLevel };
  const notEstimable = (g: number, reason: HazardRatioNotEstimable): HazardRatio => ({
    conditionId: groups[g].conditionId,
    coefficient: null,
    standardError: null,
    hazardRatio: null,
    lower: null,
    upper: null,
    pValue: null,
    notEstimable: reason,
  });
  const others = groups.map((_, g) => g).filter((g) => g !== comparisonIndex);
  if (events[comparisonIndex] === 0 || people[comparisonIndex] === 0) {
    const reason = people[comparisonIndex] === 0 ? 'nobody-randomized' : 'comparison-has-no-dropouts';
    return {
      ...base,
      hazardRatios: others.map((g) => notEstimable(g, people[g] === 0 ? 'nobody-randomized' : reason)),
      iterations: 0,
      converged: false,
      logLikelihood: null,
    };
  }
  // The fitted conditions: the comparison (baseline) and every other condition with anyone dropping out.
  const fitted = others.filter((g) => events[g] > 0);
  const included = [comparisonIndex, ...fitted];
  const p = fitted.length;

  const times = [...new Set(included.flatMap((g) => series[g].map((count) => count.time)))].sort((x, y) => x - y);
  const slices: TimeSlice[] = times.map(() => ({
    dropped: new Array<number>(included.length).fill(0),
    censored: new Array<number>(included.length).fill(0),
  }));
  const timeIndex = new Map(times.map((time, index) => [time, index]));
  included.forEach((g, column) =>
    series[g].forEach((count) => {
      const slice = slices[timeIndex.get(count.time) as number];
      slice.dropped[column] += count.dropped;
      slice.censored[column] += count.censored;
    }),
  );
  const atStart = included.map((g) => people[g]);

  // Column 0 is the comparison (no coefficient); column c ≥ 1 has coefficient beta[c − 1].
  const evaluate = (beta: number[]) => {
    const risk = [1, ...beta.map(Math.exp)];
    const atRisk = [...atStart];
    let logLikelihood = 0;
    const score = new Array<number>(p).fill(0);
    const information = Array.from({ length: p }, () => new Array<number>(p).fill(0));
    for (const slice of slices) {
      const d = slice.dropped.reduce((sum, value) => sum + value, 0);
      if (d > 0) {
        // Risk-set sums S0 = Σ n_c r_c, S1_c = n_c r_c (S2 is diagonal for indicators), and the same over the tied dropouts.
        const s1 = atRisk.map((n, c) => n * risk[c]);
        const s0 = s1.reduce((sum, value) => sum + value, 0);
        const d1 = slice.dropped.map((n, c) => n * risk[c]);
        const d0 = d1.reduce((sum, value) => sum + value, 0);
        for (let c = 1; c <= p; c += 1) {
          logLikelihood += slice.dropped[c] * beta[c - 1];
          score[c - 1] += slice.dropped[c];
        }
        for (let l = 0; l < d; l += 1) {
          const share = ties === 'efron' ? l / d : 0;
          const a0 = s0 - share * d0;
          logLikelihood -= Math.log(a0);
          for (let i = 1; i <= p; i += 1) {
            const ai = s1[i] - share * d1[i];
            score[i - 1] -= ai / a0;
            for (let j = 1; j <= p; j += 1) {
              const aj = s1[j] - share * d1[j];
              information[i - 1][j - 1] += (i === j ? ai / a0 : 0) - (ai * aj) / (a0 * a0);
            }
          }
        }
      }
      slice.dropped.forEach((n, c) => {
        atRisk[c] -= n + slice.censored[c];
      });
    }
    return { logLikelihood, score, information };
  };

  let beta = new Array<number>(p).fill(0);
  let current = evaluate(beta);
  let iterations = 0;
  let converged = false;
  while (iterations < MAX_ITERATIONS) {
    iterations += 1;
    const step = solve(current.information, current.score);
    if (step === null) break;
    let candidate = beta.map((value, i) => value + step[i]);
    let next = evaluate(candidate);
    // Step halving when the log likelihood falls (as coxph).
    for (let halving = 0; halving < 20 && !(next.logLikelihood >= current.logLikelihood - 1e-12); halving += 1) {
      candidate = beta.map((value, i) => (value + candidate[i]) / 2);
      next = evaluate(candidate);
    }
    const change = Math.abs(next.logLikelihood - current.logLikelihood);
    beta = candidate;
    current = next;
    if (change <= TOLERANCE * Math.max(1, Math.abs(current.logLikelihood))) {
      converged = true;
      break;
    }
  }
  const inverse = converged ? invert(current.information) : null;
  const z = jStat.normal.inv(1 - (1 - confidenceLevel) / 2, 0, 1);
  const hazardRatios = others.map((g): HazardRatio => {
    if (people[g] === 0) return notEstimable(g, 'nobody-randomized');
    if (events[g] === 0) return notEstimable(g, 'no-dropouts');
    const index = fitted.indexOf(g);
    if (inverse === null || !(inverse[index][index] > 0)) return notEstimable(g, 'did-not-converge');
    const coefficient = beta[index];
    const standardError = Math.sqrt(inverse[index][index]);
    if (Math.abs(coefficient) > LARGEST_COEFFICIENT || standardError > LARGEST_STANDARD_ERROR)
      return notEstimable(g, 'infinite-estimate');
    const wald = coefficient / standardError;
    return {
      conditionId: groups[g].conditionId,
      coefficient,
      standardError,
      hazardRatio: Math.exp(coefficient),
      lower: Math.exp(coefficient - z * standardError),
      upper: Math.exp(coefficient + z * standardError),
      pValue: Math.min(1, 2 * (1 - jStat.normal.cdf(Math.abs(wald), 0, 1))),
      notEstimable: null,
    };
  });
  return { ...base, hazardRatios, iterations, converged, logLikelihood: p === 0 ? null : current.logLikelihood };
}

/** Gaussian elimination with partial pivoting; null when singular. */
function solve(matrix: number[][], vector: number[]): number[] | null {
  const size = vector.length;
  if (size === 0) return [];
  const rows = matrix.map((row, i) => [...row, vector[i]]);
  for (let column = 0; column < size; column += 1) {
    let pivot = column;
    for (let row = column + 1; row < size; row += 1)
      if (Math.abs(rows[row][column]) > Math.abs(rows[pivot][column])) pivot = row;
    if (!(Math.abs(rows[pivot][column]) > 1e-14)) return null;
    [rows[column], rows[pivot]] = [rows[pivot], rows[column]];
    for (let row = 0; row < size; row += 1) {
      if (row === column) continue;
      const factor = rows[row][column] / rows[column][column];
      for (let entry = column; entry <= size; entry += 1) rows[row][entry] -= factor * rows[column][entry];
    }
  }
  return rows.map((row, i) => row[size] / row[i]);
}

function invert(matrix: number[][]): number[][] | null {
  const size = matrix.length;
  const columns: number[][] = [];
  for (let c = 0; c < size; c += 1) {
    const column = solve(
      matrix,
      matrix.map((_, r) => (r === c ? 1 : 0)),
    );
    if (column === null) return null;
    columns.push(column);
  }
  return matrix.map((_, r) => columns.map((column) => column[r]));
}
