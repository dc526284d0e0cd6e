import { jStat } from 'jstat';
import seedrandom from 'seedrandom';
import { AttritionInputError } from './attrition-input-error';
import { requireTable } from './chi-square';

export interface ExactTableTestResult {
  method: 'freeman-halton-exact' | 'monte-carlo-exact';
  /** Two-sided: the probability, given both margins, of a table no more likely than the observed one. */
  pValue: number;
  /** Tables with the observed margins that were listed (exact method); null for Monte Carlo. */
  tablesEnumerated: number | null;
  /** Monte Carlo only: tables drawn, the seed, and the standard error of the p-value √(p(1 − p)/B). */
  replicates: number | null;
  seed: string | null;
  standardError: number | null;
}

export interface ExactTableTestOptions {
  /** Above this many tables the test is run by Monte Carlo instead (default 500,000). */
  maxTables?: number;
  /** Monte Carlo draws (default 20,000) and seed (default fixed, so a report is reproducible). */
  replicates?: number;
  seed?: string;
}

// Same relative tolerance as R's fisher.test when comparing table probabilities (relErr <- 1 + 10^(-7)).
const RELATIVE_TOLERANCE = 1 + 1e-7;
const DEFAULT_MAX_TABLES = 500_000;
const DEFAULT_REPLICATES = 20_000;
const DEFAULT_SEED = 'evenhand-dropout-exact-test';

/**
 * Freeman–Halton exact test for an r×2 table (Freeman & Halton 1951, Biometrika 38:141; Fisher's exact test when
 * r = 2). Given the row totals n_i and the first-column total m, a table's probability is the multivariate
 * hypergeometric Π C(n_i, x_i) / C(N, m); the two-sided p sums the tables no more likely than the observed one, as
 * R's fisher.test does. Tables are listed by enumerating the smaller column; when there are more than `maxTables`
 * the p-value is estimated from seeded random tables with the same margins ((1 + hits) / (B + 1), as R's
 * simulate.p.value), and its standard error is returned.
 */
export function exactRowsByTwoTest(
  observed: readonly (readonly number[])[],
  options: ExactTableTestOptions = {},
  field = 'table',
): ExactTableTestResult {
  requireTable(observed, field);
  if (observed[0].length !== 2) throw new AttritionInputError(field, 'must have exactly two columns');
  const rowTotals = observed.map((row) => row[0] + row[1]);
  const firstColumn = observed.reduce((sum, row) => sum + row[0], 0);
  const total = rowTotals.reduce((sum, n) => sum + n, 0);
  // The table's probability is the same whichever column is enumerated; the smaller one has fewer tables.
  const column = firstColumn <= total - firstColumn ? 0 : 1;
  const m = column === 0 ? firstColumn : total - firstColumn;
  const cells = observed.map((row) => row[column]);
  const logC = rowTotals.map((n) => Array.from({ length: Math.min(n, m) + 1 }, (_, x) => jStat.combinationln(n, x)));
  const logNormalizer = jStat.combinationln(total, m);
  const observedLog = cells.reduce((sum, x, i) => sum + logC[i][x], 0);
  const threshold = observedLog + Math.log(RELATIVE_TOLERANCE);

  const maxTables = options.maxTables ?? DEFAULT_MAX_TABLES;
  const enumerated = enumerate(rowTotals, m, logC, threshold, logNormalizer, maxTables);
  if (enumerated !== null) {
    return {
      method: 'freeman-halton-exact',
      pValue: Math.min(1, enumerated.pValue),
      tablesEnumerated: enumerated.tables,
      replicates: null,
      seed: null,
      standardError: null,
    };
  }
  const replicates = options.replicates ?? DEFAULT_REPLICATES;
  const seed = options.seed ?? DEFAULT_SEED;
  const random = seedrandom(seed);
  let hits = 0;
  for (let b = 0; b < replicates; b += 1) {
    let remainingTotal = total;
    let remainingM = m;
    let logP = 0;
    for (let i = 0; i < rowTotals.length; i += 1) {
      const x =
        i === rowTotals.length - 1
          ? remainingM
          : drawHypergeometric(remainingTotal, remainingM, rowTotals[i], random());
      logP += logC[i][x];
      remainingTotal -= rowTotals[i];
      remainingM -= x;
    }
    if (logP <= threshold) hits += 1;
  }
  const pValue = (1 + hits) / (replicates + 1);
  return {
    method: 'monte-carlo-exact',
    pValue,
    tablesEnumerated: null,
    replicates,
    seed,
    standardError: Math.sqrt((pValue * (1 - pValue)) / replicates),
  };
}

/** Depth-first over x_1 … x_r with Σx = m and 0 ≤ x_i ≤ n_i; null when more than `maxTables` would be listed. */
function enumerate(
  rowTotals: readonly number[],
  m: number,
  logC: readonly number[][],
  threshold: number,
  logNormalizer: number,
  maxTables: number,
): { pValue: number; tables: number } | null {
  const r = rowTotals.length;
  // capacityAfter[i]: how many of the column the rows after i can still hold.
  const capacityAfter = new Array<number>(r).fill(0);
  for (let i = r - 2; i >= 0; i -= 1) capacityAfter[i] = capacityAfter[i + 1] + Math.min(rowTotals[i + 1], m);
  let tables = 0;
  let pValue = 0;
  let overflow = false;
  const visit = (i: number, remaining: number, logP: number): void => {
    if (overflow) return;
    if (i === r - 1) {
      if (remaining > rowTotals[i]) return;
      tables += 1;
      if (tables > maxTables) {
        overflow = true;
        return;
      }
      const tableLog = logP + logC[i][remaining];
      if (tableLog <= threshold) pValue += Math.exp(tableLog - logNormalizer);
      return;
    }
    const lowest = Math.max(0, remaining - capacityAfter[i]);
    const highest = Math.min(rowTotals[i], remaining);
    for (let x = lowest; x <= highest && !overflow; x += 1) visit(i + 1, remaining - x, logP + logC[i][x]);
  };
  visit(0, m, 0);
  return overflow ? null : { pValue, tables };
}

/** Inverse-CDF draw of a hypergeometric count: `draws` from `population` holding `successes`. */
function drawHypergeometric(population: number, successes: number, draws: number, u: number): number {
  const lowest = Math.max(0, draws - (population - successes));
  const highest = Math.min(draws, successes);
  let x = lowest;
  let pmf = Math.exp(
    jStat.combinationln(successes, x) +
      jStat.combinationln(population - successes, draws - x) -
      jStat.combinationln(population, draws),
  );
  let cumulative = pmf;
  while (cumulative < u && x < highest) {
    // P(x + 1) / P(x) = (K − x)(n − x) / ((x + 1)(N − K − n + x + 1))
    pmf *= ((successes - x) * (draws - x)) / ((x + 1) * (population - successes - draws + x + 1));
    x += 1;
    cumulative += pmf;
  }
  return x;
}
