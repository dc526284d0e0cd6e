import type { AttritionReport } from '../attrition-report';
import type { PayParityResult } from '../pay-parity';

export type AlertKind = 'differential-attrition' | 'log-rank' | 'pay-difference';

export type AlertRule =
  | { kind: 'differential-attrition' }
  | { kind: 'log-rank'; pValueBelow: number }
  | { kind: 'pay-difference'; amountMinor: number; basis: 'paid' | 'earned' };

export interface AlertReading {
  kind: AlertKind;
  crossed: boolean;
  /** The figure compared: differential attrition (share), a p-value, or a difference in minor units; null if not computable. */
  value: number | null;
  /** What it was compared with, in the same unit; null when there was nothing to compare. */
  threshold: number | null;
  /** One plain sentence for the e-mail. */
  summary: string;
}

const percent = (share: number) => `${(share * 100).toFixed(1)} %`;
const points = (share: number) => `${(share * 100).toFixed(1)} percentage points`;

/** Minor units as money, with the currency's own number of decimals (ISO 4217, through Intl). */
export function formatMinor(amountMinor: number, currency: string): string {
  const format = new Intl.NumberFormat('en', { style: 'currency', currency });
  return format.format(amountMinor / 10 ** (format.resolvedOptions().maximumFractionDigits ?? 2));
}

/**
 * Reads one rule off a report. Differential attrition is crossed when some pair is not low attrition under the
 * cautious WWC boundary (high attrition, or overall attrition beyond the published table); the figure is the
 * largest pairwise differential and the threshold that pair's boundary.
 */
/** Haybittle (1971) and Peto et al. (1976): a stringent level at every interim look leaves the final test's level almost intact. */
export const INTERIM_P_BOUNDARY = 0.001;

export const REPEATED_LOOKS_CAUTION =
  'Checking repeatedly as data arrive inflates false alarms: with a look every week, a p-value alert at 0.05 fires by chance far more often than 5 % of the time. Until the planned sample size is randomized, the log-rank alert uses the conservative interim boundary p < 0.001 (Haybittle 1971; Peto et al. 1976).';

export interface AlertContext {
  /** The study's planned number of participants; the interim boundary applies until this many are randomized. */
  plannedSize?: number | null;
}

export function readAlert(
  rule: AlertRule,
  report: AttritionReport,
  earned: PayParityResult,
  currency: string,
  context: AlertContext = {},
): AlertReading {
  if (rule.kind === 'differential-attrition') {
    // Every pair of conditions, as the headline on screen: a high pair is never hidden by the comparison picked.
    const failing = report.wwc.allPairs.filter(
      (pair) => pair.cautious.verdict === 'high-attrition' || pair.cautious.verdict === 'outside-published-range',
    );
    const computable = report.wwc.allPairs.filter((pair) => pair.differentialAttritionRate !== null);
    const worst = [...(failing.length > 0 ? failing : computable)].sort(
      (x, y) => (y.differentialAttritionRate ?? 0) - (x.differentialAttritionRate ?? 0),
    )[0];
    const value = worst?.differentialAttritionRate ?? null;
    const boundary = worst?.cautious.maxDifferentialPercent ?? null;
    const threshold = boundary === null ? null : boundary / 100;
    const crossed = failing.length > 0;
    const overall = worst?.overallAttritionRate ?? null;
    const summary = !crossed
      ? 'Differential attrition is within the cautious WWC boundary.'
      : worst.cautious.verdict === 'outside-published-range'
        ? `Overall attrition of ${overall === null ? 'n/a' : percent(overall)} is beyond the WWC boundary table, so attrition cannot count as low.`
        : `Differential attrition of ${points(value as number)} is above the cautious WWC boundary of ${points(threshold as number)} at an overall attrition of ${percent(overall as number)}.`;
    return { kind: rule.kind, crossed, value, threshold, summary };
  }
  if (rule.kind === 'log-rank') {
    const { pValue, statistic, df, permutation } = report.survival.logRank;
    // No planned size recorded: every look is an interim look.
    const interim =
      context.plannedSize === undefined ||
      context.plannedSize === null ||
      report.overall.randomized < context.plannedSize;
    const threshold = interim ? Math.min(rule.pValueBelow, INTERIM_P_BOUNDARY) : rule.pValueBelow;
    // With few dropouts the permutation p stands in for the asymptotic one.
    const p = permutation?.pValue ?? pValue;
    const crossed = p !== null && p < threshold;
    const level = interim
      ? `the interim boundary ${threshold} that applies until the planned size is reached`
      : `${threshold}`;
    const which = permutation
      ? `permutation p = ${permutation.pValue.toPrecision(3)} (few dropouts; asymptotic p = ${pValue?.toPrecision(3)})`
      : `p = ${p?.toPrecision(3)}`;
    const summary =
      (crossed
        ? `Time to dropout differs by condition: log-rank χ² = ${(statistic as number).toFixed(2)} on ${df} df, ${which} (below ${level}).`
        : `The log-rank test of time to dropout is not below ${level}.`) + ` ${REPEATED_LOOKS_CAUTION}`;
    return { kind: rule.kind, crossed, value: p, threshold, summary };
  }
  const comparison = (rule.basis === 'paid' ? report.payParity : earned).perRandomized;
  const difference = comparison.largestMeanDifference;
  const crossed = difference !== null && difference > rule.amountMinor;
  const summary = crossed
    ? `Mean ${rule.basis} per randomized participant differs by ${formatMinor(difference, currency)} between conditions (more than ${formatMinor(rule.amountMinor, currency)}).`
    : `Mean ${rule.basis} per randomized participant is within the chosen difference.`;
  return { kind: rule.kind, crossed, value: difference, threshold: rule.amountMinor, summary };
}

export type AlertTransition = 'crossed' | 'back-below' | 'unchanged';

/** Once per crossing: an alert is sent only on the way up; going back below re-arms it. */
export function alertTransition(wasCrossed: boolean, isCrossed: boolean): AlertTransition {
  if (isCrossed && !wasCrossed) return 'crossed';
  if (!isCrossed && wasCrossed) return 'back-below';
  return 'unchanged';
}
