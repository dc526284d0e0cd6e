import { AttritionInputError, proportion } from './attrition-input-error';
import { differentialAttrition, requireConditionIds } from './attrition-rates';
import { type ConditionAttrition, type ConditionStatusCounts, summarizeCondition } from './condition-counts';
import { type CoxModelResult, coxProportionalHazards } from './cox-model';
import { type CovariateBalanceRow, type CovariateInput, covariateBalance } from './covariate-balance';
import { type DropoutTestSummary, testDropoutByCondition } from './dropout-test';
import { type KaplanMeierCurve, type SurvivalTimeCount, kaplanMeier } from './kaplan-meier';
import { type LogRankResult, logRankTest } from './log-rank';
import { type PayParityInput, type PayParityResult, payParity } from './pay-parity';
import { type CumulativeDropout, type PlannedLengthUnknown, cumulativeDropoutAt } from './planned-length';
import {
  type StratifiedLogRankResult,
  type StratifiedTestResult,
  cochranMantelHaenszel,
  stratifiedLogRank,
} from './stratified-tests';
import { type WwcAssessment, assessWwcAgainstComparison } from './wwc-verdict';

/** Per-condition aggregates, as the service's SQL returns them, from which the whole dropout watch is computed. */
export interface AttritionReportInput {
  conditions: readonly ConditionStatusCounts[];
  /** The condition the others are compared with (WWC pairs, covariate balance); the first condition when absent. */
  comparisonConditionId?: string;
  /** Time to dropout since assignment, per condition: dropouts are events, completers and active participants censored. */
  survival: readonly { conditionId: string; counts: readonly SurvivalTimeCount[] }[];
  pay: PayParityInput;
  covariates: readonly CovariateInput[];
  /** For the Kaplan–Meier bands; 0.95 when absent. */
  confidenceLevel?: number;
  /**
   * The same follow-up split by randomization stratum (stratum key; null when none was recorded). Absent or all in
   * one stratum: the study has no strata to adjust for.
   */
  strata?: readonly { stratum: string | null; conditionId: string; counts: readonly SurvivalTimeCount[] }[];
  /** The planned study length in days since assignment, or why it is unknown. */
  plannedLength?: { days: number | null; unknown: PlannedLengthUnknown | null };
}

/** Tests of condition × dropout within randomization strata, then combined. */
export interface StratifiedReport {
  /** The strata's keys as recorded at randomization, sorted; "(none recorded)" stands for a missing key. */
  strata: string[];
  /** Fewer than two strata: there is nothing to stratify by and both tests are left out. */
  stratified: boolean;
  cmh: StratifiedTestResult | null;
  logRank: StratifiedLogRankResult | null;
}

export interface PlannedLengthReport {
  days: number | null;
  unknown: PlannedLengthUnknown | null;
  /** Per condition: Kaplan–Meier cumulative dropout by the planned length; null where follow-up does not reach it yet. */
  conditions: { conditionId: string; cumulative: CumulativeDropout | null; longestFollowUp: number | null }[];
}

export const NO_STRATUM_LABEL = '(none recorded)';

export interface AttritionReport {
  conditions: ConditionAttrition[];
  overall: {
    randomized: number;
    dropped: number;
    dropoutRateSoFar: number | null;
    windowEndedRandomized: number;
    attrited: number;
    attritionRate: number | null;
  };
  /** Largest minus smallest condition attritionRate (window ended); null with fewer than two conditions that have any. */
  differentialAttrition: number | null;
  wwc: WwcAssessment;
  /** Condition × dropped / not dropped among all randomized, active participants counting as not (yet) dropped. */
  dropoutTest: DropoutTestSummary;
  survival: {
    curves: ({ conditionId: string } & KaplanMeierCurve)[];
    logRank: LogRankResult;
    /** Each other condition against the comparison condition, Efron ties. */
    cox: CoxModelResult;
    plannedLength: PlannedLengthReport;
  };
  stratified: StratifiedReport;
  payParity: PayParityResult;
  covariateBalance: CovariateBalanceRow[];
}

function requireSameConditions(ids: readonly string[], expected: readonly string[], field: string): void {
  requireConditionIds(ids, field);
  const missing = expected.filter((id) => !ids.includes(id));
  const unknown = ids.filter((id) => !expected.includes(id));
  if (missing.length > 0) throw new AttritionInputError(field, `has no entry for condition(s) ${missing.join(', ')}`);
  if (unknown.length > 0)
    throw new AttritionInputError(field, `names condition(s) that are not in conditions: ${unknown.join(', ')}`);
}

function inConditionOrder<T extends { conditionId: string }>(entries: readonly T[], ids: readonly string[]): T[] {
  return ids.map((id) => entries.find((entry) => entry.conditionId === id) as T);
}

/** Where an entry sat in the caller's list, so an error names the field the caller sent. */
function inputIndex(entries: readonly { conditionId: string }[], conditionId: string): number {
  return entries.findIndex((entry) => entry.conditionId === conditionId);
}

export function buildAttritionReport(input: AttritionReportInput): AttritionReport {
  const conditions = input.conditions.map((counts, index) => summarizeCondition(counts, `conditions[${index}]`));
  const ids = conditions.map((condition) => condition.conditionId);
  requireConditionIds(ids, 'conditions');
  if (input.comparisonConditionId !== undefined && !ids.includes(input.comparisonConditionId)) {
    throw new AttritionInputError(
      'comparisonConditionId',
      `"${input.comparisonConditionId}" is not one of the study's conditions`,
    );
  }
  requireSameConditions(
    input.survival.map((entry) => entry.conditionId),
    ids,
    'survival',
  );
  requireSameConditions(
    input.pay.conditions.map((entry) => entry.conditionId),
    ids,
    'pay.conditions',
  );
  input.covariates.forEach((covariate, index) =>
    requireSameConditions(
      covariate.byCondition.map((entry) => entry.conditionId),
      ids,
      `covariates[${index}].byCondition`,
    ),
  );

  const survival = inConditionOrder(input.survival, ids);
  const curves = survival.map((entry, index) => {
    const at = `survival[${inputIndex(input.survival, entry.conditionId)}]`;
    const curve = kaplanMeier(entry.counts, { confidenceLevel: input.confidenceLevel }, `${at}.counts`);
    const condition = conditions[index];
    const dropped = curve.steps.reduce((total, step) => total + step.dropped, 0);
    if (curve.atStart !== condition.randomized || dropped !== condition.dropped) {
      throw new AttritionInputError(
        at,
        `counts ${curve.atStart} participants and ${dropped} dropouts for ${condition.conditionId}, ` +
          `but conditions has ${condition.randomized} and ${condition.dropped}`,
      );
    }
    return { conditionId: entry.conditionId, ...curve };
  });

  input.pay.conditions.forEach((entry, index) => {
    const { randomized, completed } = conditions[ids.indexOf(entry.conditionId)];
    const at = `pay.conditions[${index}]`;
    if (entry.perRandomized.n !== randomized) {
      throw new AttritionInputError(
        `${at}.perRandomized.n`,
        `must equal the condition's randomized count (${randomized})`,
      );
    }
    if (entry.perCompleter.n !== completed) {
      throw new AttritionInputError(
        `${at}.perCompleter.n`,
        `must equal the condition's completed count (${completed})`,
      );
    }
  });

  const sum = (pick: (condition: ConditionAttrition) => number) =>
    conditions.reduce((total, condition) => total + pick(condition), 0);
  const randomized = sum((c) => c.randomized);
  const dropped = sum((c) => c.dropped);
  const windowEndedRandomized = sum((c) => c.windowEnded.randomized);
  const attrited = sum((c) => c.attrited);
  const comparisonConditionId = input.comparisonConditionId ?? ids[0];
  // Computed in the caller's order so that errors name the caller's fields, then listed in condition order.
  const pay = payParity({ ...input.pay, comparisonConditionId });
  const plannedDays = input.plannedLength?.days ?? null;
  const attritionCounts = conditions.map((c) => ({
    conditionId: c.conditionId,
    randomized: c.windowEnded.randomized,
    attrited: c.attrited,
  }));

  return {
    conditions,
    overall: {
      randomized,
      dropped,
      dropoutRateSoFar: proportion(dropped, randomized),
      windowEndedRandomized,
      attrited,
      attritionRate: proportion(attrited, windowEndedRandomized),
    },
    differentialAttrition: differentialAttrition(attritionCounts),
    wwc: assessWwcAgainstComparison(attritionCounts, comparisonConditionId),
    dropoutTest: testDropoutByCondition(
      conditions
        .filter((c) => c.randomized > 0)
        .map((c) => ({ dropped: c.dropped, notDropped: c.randomized - c.dropped })),
    ),
    survival: {
      curves,
      logRank: logRankTest(survival),
      cox: coxProportionalHazards(survival, comparisonConditionId),
      plannedLength: {
        days: plannedDays,
        unknown: input.plannedLength?.unknown ?? (plannedDays === null ? 'no-steps' : null),
        conditions: curves.map((curve) => ({
          conditionId: curve.conditionId,
          cumulative: plannedDays === null ? null : cumulativeDropoutAt(curve, plannedDays),
          longestFollowUp: curve.steps.at(-1)?.time ?? null,
        })),
      },
    },
    stratified: stratifiedReport(input.strata ?? [], conditions),
    payParity: { ...pay, conditions: inConditionOrder(pay.conditions, ids) },
    covariateBalance: covariateBalance(input.covariates, comparisonConditionId),
  };
}

function stratifiedReport(
  rows: NonNullable<AttritionReportInput['strata']>,
  conditions: readonly ConditionAttrition[],
): StratifiedReport {
  const ids = conditions.map((condition) => condition.conditionId);
  rows.forEach((row, index) => {
    if (!ids.includes(row.conditionId))
      throw new AttritionInputError(
        `strata[${index}].conditionId`,
        `"${row.conditionId}" is not one of the study's conditions`,
      );
  });
  const names = [...new Set(rows.map((row) => row.stratum ?? NO_STRATUM_LABEL))].sort((x, y) =>
    x < y ? -1 : x > y ? 1 : 0,
  );
  // The strata must partition the same people the pooled figures count.
  conditions.forEach((condition) => {
    const counts = rows.filter((row) => row.conditionId === condition.conditionId).flatMap((row) => row.counts);
    const people = counts.reduce((total, count) => total + count.dropped + count.censored, 0);
    const dropped = counts.reduce((total, count) => total + count.dropped, 0);
    if (rows.length > 0 && (people !== condition.randomized || dropped !== condition.dropped)) {
      throw new AttritionInputError(
        'strata',
        `counts ${people} participants and ${dropped} dropouts for ${condition.conditionId}, but conditions has ${condition.randomized} and ${condition.dropped}`,
      );
    }
  });
  if (names.length < 2) return { strata: names, stratified: false, cmh: null, logRank: null };
  const byStratum = names.map((stratum) => ({
    stratum,
    groups: ids.map((conditionId) => ({
      conditionId,
      counts: rows
        .filter((row) => (row.stratum ?? NO_STRATUM_LABEL) === stratum && row.conditionId === conditionId)
        .flatMap((row) => row.counts),
    })),
  }));
  const cmh = cochranMantelHaenszel(
    byStratum.map(({ stratum, groups }) => ({
      stratum,
      conditions: groups.map((group) => ({
        randomized: group.counts.reduce((total, count) => total + count.dropped + count.censored, 0),
        dropped: group.counts.reduce((total, count) => total + count.dropped, 0),
      })),
    })),
  );
  return { strata: names, stratified: true, cmh, logRank: stratifiedLogRank(byStratum) };
}
