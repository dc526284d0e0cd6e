import { type AttritionCount, attritionRate, overallAttrition, requireConditionIds } from './attrition-rates';
import { AttritionInputError } from './attrition-input-error';
import { type Interval, type RiskRatio, newcombeDifferenceInterval, riskRatio } from './intervals';
import { WWC_HIGHEST_TABULATED_OVERALL_PERCENT, type WwcBoundaryRow, wwcBoundaryRow } from './wwc-boundaries';

export type WwcVerdict = 'low-attrition' | 'high-attrition' | 'outside-published-range' | 'not-computable';

export interface WwcBoundaryVerdict {
  verdict: WwcVerdict;
  /** The boundary on the table row used, in percentage points; null when no row applies. */
  maxDifferentialPercent: number | null;
  /** The whole-percent row whose boundary was used (the stricter of the rows around the overall rate); null if none. */
  overallPercentRow: number | null;
}

export interface WwcPairAssessment {
  conditionId: string;
  comparisonConditionId: string;
  /** Pooled over the two conditions of the pair, as the WWC defines it for one contrast. */
  overallAttritionRate: number | null;
  differentialAttritionRate: number | null;
  /** The row the cautious verdict used (see WWC_ROW_RULE); null if not computable. */
  overallPercentRow: number | null;
  /** The table rows around the overall rate: one at an exact whole percent, else the two it lies between. */
  overallPercentRows: number[];
  cautious: WwcBoundaryVerdict;
  optimistic: WwcBoundaryVerdict;
  /** 95 % Newcombe interval for condition minus comparison attrition rate; null if not computable. */
  differenceInterval: Interval | null;
  /** Attrition risk ratio, condition over comparison, with its 95 % Katz interval; null when either has no attrition. */
  riskRatio: RiskRatio | null;
}

export interface WwcAssessment {
  comparisonConditionId: string | null;
  /** The view the researcher picked: each other condition against the comparison condition. */
  pairs: WwcPairAssessment[];
  /** Every pair of conditions, so no contrast goes unjudged whichever comparison is picked. */
  allPairs: WwcPairAssessment[];
  /** The least favourable of all pairs, so one high-attrition contrast is never hidden by the others. */
  cautious: WwcVerdict;
  optimistic: WwcVerdict;
  /** The pair behind each headline: the most severe verdict, then the largest excess over its boundary. */
  worstPair: { cautious: WwcPairAssessment | null; optimistic: WwcPairAssessment | null };
}

export type ConditionAttritionCount = AttritionCount & { conditionId: string };

/**
 * How an overall rate finds its row in the boundary table. The handbook's table lists whole percents only; the text
 * saying how a rate between two of them is read could not be found in the sources available while this was written
 * (a public R implementation, RWWC attritest, truncates to the row below — more lenient above 10 % overall). Until
 * that text is cited, the rule here can never be more lenient than the table: a rate at an exact whole percent reads
 * its own row; a rate between two rows is judged on the stricter of the two boundaries. The differential is compared
 * unrounded and exactly, and "at or below the boundary" counts as low attrition.
 */
export const WWC_ROW_RULE =
  'A rate at an exact whole percent uses its own row of the WWC boundary table; a rate between two rows is judged on the stricter of the two, so no rate is judged more leniently than a row beside it. The differential is compared unrounded. (The handbook text on rounding was not available to cite; this rule is our conservative reading of the whole-percent table.)';

/** The whole-percent rows around attrited / randomized, computed in integers so no floating-point edge moves a row. */
export function overallPercentRows(attrited: bigint, randomized: bigint): number[] {
  const lower = Number((100n * attrited) / randomized);
  return (100n * attrited) % randomized === 0n ? [lower] : [lower, lower + 1];
}

function boundaryVerdict(condition: AttritionCount, comparison: AttritionCount, tenthsOfPercent: number): WwcVerdict {
  // |a/na − b/nb| ≤ t/1000  ⇔  1000·|a·nb − b·na| ≤ t·na·nb
  const gap =
    BigInt(condition.attrited) * BigInt(comparison.randomized) -
    BigInt(comparison.attrited) * BigInt(condition.randomized);
  const absoluteGap = gap < 0n ? -gap : gap;
  const allowed = BigInt(tenthsOfPercent) * BigInt(condition.randomized) * BigInt(comparison.randomized);
  return 1000n * absoluteGap <= allowed ? 'low-attrition' : 'high-attrition';
}

// WWC Procedures and Standards Handbook v4.1, attrition standard: low attrition when the differential rate is at or below
// the boundary for the overall rate, under the cautious and under the optimistic assumption.
export function assessWwcPair(
  condition: AttritionCount,
  comparison: AttritionCount,
): Omit<WwcPairAssessment, 'conditionId' | 'comparisonConditionId'> {
  const conditionRate = attritionRate(condition, 'condition');
  const comparisonRate = attritionRate(comparison, 'comparison');
  const overallAttritionRate = overallAttrition([condition, comparison]);
  const notComputable = { verdict: 'not-computable' as const, maxDifferentialPercent: null, overallPercentRow: null };
  if (conditionRate === null || comparisonRate === null || overallAttritionRate === null) {
    return {
      overallAttritionRate,
      differentialAttritionRate: null,
      overallPercentRow: null,
      overallPercentRows: [],
      cautious: notComputable,
      optimistic: notComputable,
      differenceInterval: null,
      riskRatio: null,
    };
  }
  const differentialAttritionRate = Math.abs(conditionRate - comparisonRate);
  const rows = overallPercentRows(
    BigInt(condition.attrited + comparison.attrited),
    BigInt(condition.randomized + comparison.randomized),
  );
  const judge = (pick: (row: WwcBoundaryRow) => number): WwcBoundaryVerdict => {
    const tableRows = rows.map((percent) =>
      percent > WWC_HIGHEST_TABULATED_OVERALL_PERCENT ? null : wwcBoundaryRow(percent),
    );
    if (tableRows.some((row) => row === null)) {
      return { verdict: 'outside-published-range', maxDifferentialPercent: null, overallPercentRow: null };
    }
    const stricter = (tableRows as WwcBoundaryRow[]).reduce((best, row) => (pick(row) < pick(best) ? row : best));
    const maxDifferentialPercent = pick(stricter);
    return {
      verdict: boundaryVerdict(condition, comparison, Math.round(maxDifferentialPercent * 10)),
      maxDifferentialPercent,
      overallPercentRow: stricter.overallAttritionPercent,
    };
  };
  const cautious = judge((row) => row.maxDifferentialPercentCautious);
  const optimistic = judge((row) => row.maxDifferentialPercentOptimistic);
  return {
    overallAttritionRate,
    differentialAttritionRate,
    overallPercentRow: cautious.overallPercentRow,
    overallPercentRows: rows,
    cautious,
    optimistic,
    differenceInterval: newcombeDifferenceInterval(
      condition.attrited,
      condition.randomized,
      comparison.attrited,
      comparison.randomized,
    ),
    riskRatio: riskRatio(condition.attrited, condition.randomized, comparison.attrited, comparison.randomized),
  };
}

const SEVERITY: readonly WwcVerdict[] = [
  'low-attrition',
  'not-computable',
  'outside-published-range',
  'high-attrition',
];

function leastFavourable(verdicts: WwcVerdict[]): WwcVerdict {
  if (verdicts.length === 0) return 'not-computable';
  return verdicts.reduce((worst, verdict) => (SEVERITY.indexOf(verdict) > SEVERITY.indexOf(worst) ? verdict : worst));
}

/** Most severe verdict first; among equals, the largest differential beyond (or closest to) its boundary. */
function worstPairUnder(
  pairs: readonly WwcPairAssessment[],
  boundary: 'cautious' | 'optimistic',
): WwcPairAssessment | null {
  const excess = (pair: WwcPairAssessment) =>
    (pair.differentialAttritionRate ?? -Infinity) * 100 - (pair[boundary].maxDifferentialPercent ?? 0);
  return (
    [...pairs].sort(
      (x, y) => SEVERITY.indexOf(y[boundary].verdict) - SEVERITY.indexOf(x[boundary].verdict) || excess(y) - excess(x),
    )[0] ?? null
  );
}

/**
 * With more than two conditions the WWC verdict is applied to every pair of conditions; the headline is the least
 * favourable pair. The comparison condition the researcher picks (the first when none is picked) only chooses
 * which pairs `pairs` lists as a view.
 */
export function assessWwcAgainstComparison(
  conditions: readonly ConditionAttritionCount[],
  comparisonConditionId?: string,
): WwcAssessment {
  requireConditionIds(
    conditions.map((condition) => condition.conditionId),
    'conditions',
  );
  if (conditions.length === 0) {
    return {
      comparisonConditionId: null,
      pairs: [],
      allPairs: [],
      cautious: 'not-computable',
      optimistic: 'not-computable',
      worstPair: { cautious: null, optimistic: null },
    };
  }
  const comparison =
    comparisonConditionId === undefined
      ? conditions[0]
      : conditions.find((c) => c.conditionId === comparisonConditionId);
  if (comparison === undefined) {
    throw new AttritionInputError(
      'comparisonConditionId',
      `"${comparisonConditionId}" is not one of the study's conditions`,
    );
  }
  const assess = (condition: ConditionAttritionCount, against: ConditionAttritionCount): WwcPairAssessment => ({
    conditionId: condition.conditionId,
    comparisonConditionId: against.conditionId,
    ...assessWwcPair(condition, against),
  });
  const pairs = conditions
    .filter((condition) => condition !== comparison)
    .map((condition) => assess(condition, comparison));
  const allPairs = conditions.flatMap((condition, i) =>
    conditions.slice(i + 1).map((other) => assess(condition, other)),
  );
  return {
    comparisonConditionId: comparison.conditionId,
    pairs,
    allPairs,
    cautious: leastFavourable(allPairs.map((pair) => pair.cautious.verdict)),
    optimistic: leastFavourable(allPairs.map((pair) => pair.optimistic.verdict)),
    worstPair: { cautious: worstPairUnder(allPairs, 'cautious'), optimistic: worstPairUnder(allPairs, 'optimistic') },
  };
}
