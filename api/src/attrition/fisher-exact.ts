import { jStat } from 'jstat';
import { AttritionInputError } from './attrition-input-error';
import { requireTable } from './chi-square';

export interface FisherExactResult {
  method: 'fisher-exact';
  /** Sum of the probabilities of all tables with the same margins that are no more likely than the observed one. */
  pValueTwoSided: number;
  /** P(top-left cell ≥ observed): the first row has the larger share in the first column. */
  pValueGreater: number;
  /** P(top-left cell ≤ observed). */
  pValueLess: number;
}

// Relative tolerance when comparing table probabilities for the two-sided p, as R's fisher.test (relErr <- 1 + 10^(-7)).
const RELATIVE_TOLERANCE = 1 + 1e-7;

// Fisher's exact test for a 2×2 table (Fisher 1935): the top-left cell is hypergeometric given the margins;
// two-sided p sums the probabilities ≤ the observed one, as R's stats::fisher.test does.
export function fisherExact(observed: readonly (readonly number[])[], field = 'table'): FisherExactResult {
  requireTable(observed, field);
  if (observed.length !== 2 || observed[0].length !== 2) throw new AttritionInputError(field, 'must be a 2×2 table');
  const [[a, b], [c, d]] = observed;
  const firstColumn = a + c;
  const secondColumn = b + d;
  const firstRow = a + b;
  const lowest = Math.max(0, firstRow - secondColumn);
  const highest = Math.min(firstRow, firstColumn);

  const logProbabilities: number[] = [];
  for (let x = lowest; x <= highest; x += 1) {
    logProbabilities.push(jStat.combinationln(firstColumn, x) + jStat.combinationln(secondColumn, firstRow - x));
  }
  // Scale by the largest term and normalise, so that large margins neither underflow nor lose the ratio between terms.
  const largest = logProbabilities.reduce((max, logP) => Math.max(max, logP), -Infinity);
  const scaled = logProbabilities.map((logP) => Math.exp(logP - largest));
  const sum = scaled.reduce((total, p) => total + p, 0);
  const probabilities = scaled.map((p) => p / sum);
  const observedIndex = a - lowest;
  const observedProbability = probabilities[observedIndex];

  let pValueLess = 0;
  let pValueGreater = 0;
  let pValueTwoSided = 0;
  probabilities.forEach((p, index) => {
    if (index <= observedIndex) pValueLess += p;
    if (index >= observedIndex) pValueGreater += p;
    if (p <= observedProbability * RELATIVE_TOLERANCE) pValueTwoSided += p;
  });
  const clamp = (p: number) => Math.min(1, p);
  return {
    method: 'fisher-exact',
    pValueTwoSided: clamp(pValueTwoSided),
    pValueGreater: clamp(pValueGreater),
    pValueLess: clamp(pValueLess),
  };
}
