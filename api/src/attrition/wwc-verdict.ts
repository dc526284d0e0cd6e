import { type AttritionCount, attritionRate, overallAttrition, requireConditionIds } from './attrition-rates';
import { AttritionInputError } from './attrition-input-error';
import { WWC_HIGHEST_TABULATED_OVERALL_PERCENT, wwcBoundaryRow } from './wwc-boundaries';

export type WwcVerdict = 'low-attrition' | 'high-attrition' | 'outside-published-range' | 'not-computable';

export interface WwcBoundaryVerdict {
  verdict: WwcVerdict;
  /** The boundary on the table row used, in percentage points; null when no row applies. */
  maxDifferentialPercent: number | null;
}

export interface WwcPairAssessment {
  conditionId: string;
  comparisonConditionId: string;
  /** Pooled over the two conditions of the pair, as the WWC defines it for one contrast. */
  overallAttritionRate: number | null;
  differentialAttritionRate: number | null;
  /** The whole-percent row of the boundary table the verdict used (overall rate rounded half up); null if not computable. */
  overallPercentRow: number | null;
  cautious: WwcBoundaryVerdict;
  optimistic: WwcBoundaryVerdict;
}

export interface WwcAssessment {
  comparisonConditionId: string | null;
  pairs: WwcPairAssessment[];
  /** The least favourable pair's verdict, so one high-attrition contrast is never hidden by the others. */
  cautious: WwcVerdict;
  optimistic: WwcVerdict;
}

export type ConditionAttritionCount = AttritionCount & { conditionId: string };

// Rounding choice: the handbook rows are whole percents, so the pooled overall rate is rounded to the nearest whole
// percent with halves going up (56.5 % reads row 57, 57.5 % is beyond the table); the differential is compared unrounded
// and exactly (integer arithmetic, no floating-point edge), and "at or below the boundary" counts as low attrition.
function roundedOverallPercent(attrited: bigint, randomized: bigint): number {
  return Number((200n * attrited + randomized) / (2n * randomized));
}

function boundaryVerdict(condition: AttritionCount, comparison: AttritionCount, tenthsOfPercent: number): WwcVerdict {
  // |a/na − b/nb| ≤ t/1000  ⇔  1000·|a·nb − b·na| ≤ t·na·nb
  const gap = BigInt(condition.attrited) * BigInt(comparison.randomized) - BigInt(comparison.attrited) * BigInt(condition.randomized);
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
  const notComputable = { verdict: 'not-computable' as const, maxDifferentialPercent: null };
  if (conditionRate === null || comparisonRate === null || overallAttritionRate === null) {
    return {
      overallAttritionRate,
      differentialAttritionRate: null,
      overallPercentRow: null,
      cautious: notComputable,
      optimistic: notComputable,
    };
  }
  const differentialAttritionRate = Math.abs(conditionRate - comparisonRate);
  const overallPercentRow = roundedOverallPercent(
    BigInt(condition.attrited + comparison.attrited),
    BigInt(condition.randomized + comparison.randomized),
  );
  const row = wwcBoundaryRow(overallPercentRow);
  if (overallPercentRow > WWC_HIGHEST_TABULATED_OVERALL_PERCENT || row === null) {
    const outside = { verdict: 'outside-published-range' as const, maxDifferentialPercent: null };
    return { overallAttritionRate, differentialAttritionRate, overallPercentRow, cautious: outside, optimistic: outside };
  }
  const judge = (maxDifferentialPercent: number): WwcBoundaryVerdict => ({
    verdict: boundaryVerdict(condition, comparison, Math.round(maxDifferentialPercent * 10)),
    maxDifferentialPercent,
  });
  return {
    overallAttritionRate,
    differentialAttritionRate,
    overallPercentRow,
    cautious: judge(row.maxDifferentialPercentCautious),
    optimistic: judge(row.maxDifferentialPercentOptimistic),
  };
}

const SEVERITY: readonly WwcVerdict[] = ['low-attrition', 'not-computable', 'outside-published-range', 'high-attrition'];

function leastFavourable(verdicts: WwcVerdict[]): WwcVerdict {
  if (verdicts.length === 0) return 'not-computable';
  return verdicts.reduce((worst, verdict) => (SEVERITY.indexOf(verdict) > SEVERITY.indexOf(worst) ? verdict : worst));
}

/**
 * With more than two conditions the WWC verdict is applied pairwise: each other condition against the comparison
 * condition the researcher picks (the first condition when none is picked).
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
    return { comparisonConditionId: null, pairs: [], cautious: 'not-computable', optimistic: 'not-computable' };
  }
  const comparison = comparisonConditionId === undefined ? conditions[0] : conditions.find((c) => c.conditionId === comparisonConditionId);
  if (comparison === undefined) {
    throw new AttritionInputError('comparisonConditionId', `"${comparisonConditionId}" is not one of the study's conditions`);
  }
  const pairs = conditions
    .filter((condition) => condition !== comparison)
    .map((condition) => ({
      conditionId: condition.conditionId,
      comparisonConditionId: comparison.conditionId,
      ...assessWwcPair(condition, comparison),
    }));
  return {
    comparisonConditionId: comparison.conditionId,
    pairs,
    cautious: leastFavourable(pairs.map((pair) => pair.cautious.verdict)),
    optimistic: leastFavourable(pairs.map((pair) => pair.optimistic.verdict)),
  };
}
