import type { AttritionReportInput } from './attrition-report';
import type { AttritionAggregates, CovariateRow, FlowRow } from './attrition-sql';
import type { ConditionStatusCounts } from './condition-counts';
import type { BinaryCount, CovariateInput } from './covariate-balance';
import type { PayParityInput } from './pay-parity';
import { plannedStudyLength } from './planned-length';
import type { Moments } from './sufficient-statistics';

/** One arm of the report: a condition, or in a within-subjects study one order of conditions. */
export interface ReportArm {
  id: string;
  /** The condition's code while the study is blinded, else its internal name; for orders, those joined by " → ". */
  name: string;
}

const RANDOMIZED_STATUSES = new Set(['assigned', 'active', 'completed', 'withdrew', 'lost']);
const NO_MOMENTS: Moments = { n: 0, sum: 0, sumOfSquares: 0 };

/** The same rule as randomizedPredicate in attrition-sql.ts, applied to a grouped row. */
export function isRandomized(row: Pick<FlowRow, 'arm' | 'status' | 'assigned'>): boolean {
  return row.arm !== null && (RANDOMIZED_STATUSES.has(row.status) || (row.status === 'excluded' && row.assigned));
}

/**
 * Status counts per arm. Participation window rule: it has ended for everyone once the study is closed; while it
 * runs, for those who completed, withdrew, were lost or were excluded after randomization. Active participants
 * are therefore never counted as attrition before the study ends, and once it is closed anyone still active is
 * `incompleteAtClose` (COUNTING_RULE in condition-counts.ts).
 */
export function statusCounts(
  flow: readonly FlowRow[],
  arms: readonly ReportArm[],
  studyClosed: boolean,
): ConditionStatusCounts[] {
  return arms.map((arm) => {
    const counts = { active: 0, completed: 0, withdrew: 0, lost: 0, excludedAfterRandomization: 0 };
    for (const row of flow) {
      if (row.arm !== arm.id || !isRandomized(row)) continue;
      if (row.status === 'assigned' || row.status === 'active') counts.active += row.n;
      else if (row.status === 'excluded') counts.excludedAfterRandomization += row.n;
      else counts[row.status as 'completed' | 'withdrew' | 'lost'] += row.n;
    }
    const randomized =
      counts.active + counts.completed + counts.withdrew + counts.lost + counts.excludedAfterRandomization;
    const incompleteAtClose = studyClosed ? counts.active : 0;
    const active = counts.active - incompleteAtClose;
    return {
      conditionId: arm.id,
      randomized,
      ...counts,
      active,
      incompleteAtClose,
      windowEnded: { randomized: randomized - active, completed: counts.completed },
    };
  });
}

function moments(n: number, sum: string | number | null, squares: string | number | null): Moments {
  return n === 0 ? NO_MOMENTS : { n, sum: Number(sum ?? 0), sumOfSquares: Number(squares ?? 0) };
}

function payInput(
  aggregates: AttritionAggregates,
  arms: readonly ReportArm[],
  currency: string,
  basis: 'paid' | 'earned',
): PayParityInput {
  return {
    currency,
    payOverrideRecorded: aggregates.payOverrideRecorded,
    conditions: arms.map((arm) => {
      const row = aggregates.pay.find((entry) => entry.arm === arm.id);
      if (!row) return { conditionId: arm.id, perRandomized: NO_MOMENTS, perCompleter: NO_MOMENTS };
      return {
        conditionId: arm.id,
        perRandomized: moments(row.randomized, row[`${basis}_sum`], row[`${basis}_squares`]),
        perCompleter: moments(row.completed, row[`${basis}_completer_sum`], row[`${basis}_completer_squares`]),
      };
    }),
  };
}

/** Covariate name of one category's indicator, e.g. `handedness=left`. */
export function categoryCovariate(key: string, category: string): string {
  return `${key}=${category}`;
}

function covariateInputs(rows: readonly CovariateRow[], arms: readonly ReportArm[]): CovariateInput[] {
  const inputs: CovariateInput[] = [];
  const numericKeys = [...new Set(rows.filter((row) => row.kind === 'number').map((row) => row.key))].sort();
  for (const key of numericKeys) {
    inputs.push({
      covariate: key,
      kind: 'continuous',
      byCondition: arms.map((arm) => {
        const row = rows.find((entry) => entry.kind === 'number' && entry.key === key && entry.arm === arm.id);
        return {
          conditionId: arm.id,
          allRandomized: row ? moments(row.n, row.sum, row.squares) : NO_MOMENTS,
          completers: row ? moments(row.completer_n, row.completer_sum, row.completer_squares) : NO_MOMENTS,
        };
      }),
    });
  }

  // Each category of a string covariate is one indicator among those who answered; a boolean one only "true".
  const categorical = rows.filter((row) => row.kind !== 'number');
  const indicators = new Map<string, { key: string; kind: CovariateRow['kind']; category: string }>();
  for (const row of categorical) {
    const category = row.kind === 'boolean' ? 'true' : row.category;
    if (category === null) continue;
    indicators.set(`${row.kind}\u0000${row.key}\u0000${category}`, { key: row.key, kind: row.kind, category });
  }
  const sorted = [...indicators.values()].sort((x, y) =>
    categoryCovariate(x.key, x.category).localeCompare(categoryCovariate(y.key, y.category), 'en'),
  );
  for (const { key, kind, category } of sorted) {
    const binary = (arm: ReportArm, completers: boolean): BinaryCount => {
      const answered = categorical.filter((row) => row.arm === arm.id && row.key === key && row.kind === kind);
      const pick = (row: CovariateRow) => (completers ? row.completer_n : row.n);
      return {
        n: answered.reduce((total, row) => total + pick(row), 0),
        count: answered.filter((row) => row.category === category).reduce((total, row) => total + pick(row), 0),
      };
    };
    inputs.push({
      covariate: categoryCovariate(key, category),
      kind: 'binary',
      byCondition: arms.map((arm) => ({
        conditionId: arm.id,
        allRandomized: binary(arm, false),
        completers: binary(arm, true),
      })),
    });
  }
  return inputs;
}

/** Follow-up per stratum and arm (arms nobody in a stratum is in get no counts there). */
function stratumInputs(
  aggregates: AttritionAggregates,
  arms: readonly ReportArm[],
): NonNullable<AttritionReportInput['strata']> {
  const armIds = new Set(arms.map((arm) => arm.id));
  const groups = new Map<
    string,
    { stratum: string | null; conditionId: string; counts: { time: number; dropped: number; censored: number }[] }
  >();
  for (const row of aggregates.strata) {
    if (!armIds.has(row.arm)) continue;
    const key = JSON.stringify([row.stratum, row.arm]);
    const group = groups.get(key) ?? { stratum: row.stratum, conditionId: row.arm, counts: [] };
    group.counts.push({ time: row.day, dropped: row.dropped, censored: row.censored });
    groups.set(key, group);
  }
  return [...groups.values()];
}

/** The inputs of buildAttritionReport (paid amounts) and of payParity for earned amounts, from the SQL aggregates. */
export function toReportInput(
  aggregates: AttritionAggregates,
  arms: readonly ReportArm[],
  options: { studyClosed: boolean; currency: string; comparisonConditionId?: string },
): { report: AttritionReportInput; earned: PayParityInput } {
  return {
    report: {
      conditions: statusCounts(aggregates.flow, arms, options.studyClosed),
      comparisonConditionId: options.comparisonConditionId,
      survival: arms.map((arm) => ({
        conditionId: arm.id,
        counts: aggregates.survival
          .filter((row) => row.arm === arm.id)
          .map((row) => ({ time: row.day, dropped: row.dropped, censored: row.censored })),
      })),
      pay: payInput(aggregates, arms, options.currency, 'paid'),
      covariates: covariateInputs(aggregates.covariates, arms),
      strata: stratumInputs(aggregates, arms),
      plannedLength: plannedStudyLength(
        aggregates.steps.map((step) => ({
          opensAfterDays: step.opens_after_days,
          opensFrom: step.opens_from,
          dueWithinDays: step.due_within_days,
        })),
      ),
    },
    earned: payInput(aggregates, arms, options.currency, 'earned'),
  };
}

export interface ReasonCount {
  /** Null when none was recorded. */
  reason: string | null;
  count: number;
}

export interface FlowBox {
  total: number;
  /** The most frequent reasons (at most REASONS_SHOWN), most frequent first. */
  reasons: ReasonCount[];
  /** Participants whose reason is not among those listed. */
  otherReasons: number;
}

export interface ArmFlow {
  conditionId: string;
  allocated: number;
  /** Still active while the study runs; 0 once it is closed. */
  stillInFollowUp: number;
  /** Still active when the study closed: did not complete (COUNTING_RULE). */
  incompleteAtClose: number;
  withdrew: FlowBox;
  lostToFollowUp: FlowBox;
  excludedAfterRandomization: FlowBox;
  /** Analysed by intention to treat: everyone allocated, whatever happened to them (CONSORT 2010 item 16). */
  analysed: number;
  /** Completers: the participants with complete outcome data. */
  completers: number;
}

/** CONSORT 2010 flow: enrollment, allocation, follow-up, analysis. */
export interface ConsortFlow {
  /** Everyone who joined or was imported onto the roster. */
  assessedForEligibility: number;
  excludedBeforeRandomization: FlowBox;
  /** Invited, screened or consented but not (yet) assigned: a box CONSORT has no name for while a study runs. */
  awaitingRandomization: { total: number; invited: number; screened: number; consented: number };
  randomized: number;
  arms: ArmFlow[];
}

export const REASONS_SHOWN = 10;

function box(rows: readonly FlowRow[]): FlowBox {
  const byReason = new Map<string | null, number>();
  for (const row of rows) {
    const reason = row.reason?.trim() ? row.reason.trim() : null;
    byReason.set(reason, (byReason.get(reason) ?? 0) + row.n);
  }
  const reasons = [...byReason]
    .map(([reason, count]) => ({ reason, count }))
    .sort((x, y) => y.count - x.count || (x.reason ?? '\uffff').localeCompare(y.reason ?? '\uffff', 'en'));
  const shown = reasons.slice(0, REASONS_SHOWN);
  const total = reasons.reduce((sum, entry) => sum + entry.count, 0);
  return { total, reasons: shown, otherReasons: total - shown.reduce((sum, entry) => sum + entry.count, 0) };
}

export function consortFlow(flow: readonly FlowRow[], arms: readonly ReportArm[], studyClosed = false): ConsortFlow {
  const sum = (rows: readonly FlowRow[]) => rows.reduce((total, row) => total + row.n, 0);
  const waiting = (status: string) => sum(flow.filter((row) => row.status === status && !isRandomized(row)));
  const invited = waiting('invited');
  const screened = waiting('screened');
  const consented = waiting('consented');
  const armFlows = arms.map((arm): ArmFlow => {
    const rows = flow.filter((row) => row.arm === arm.id && isRandomized(row));
    const withStatus = (...statuses: string[]) => rows.filter((row) => statuses.includes(row.status));
    const stillActive = sum(withStatus('assigned', 'active'));
    const allocated = sum(rows);
    return {
      conditionId: arm.id,
      allocated,
      stillInFollowUp: studyClosed ? 0 : stillActive,
      incompleteAtClose: studyClosed ? stillActive : 0,
      withdrew: box(withStatus('withdrew')),
      lostToFollowUp: box(withStatus('lost')),
      excludedAfterRandomization: box(withStatus('excluded')),
      analysed: allocated,
      completers: sum(withStatus('completed')),
    };
  });
  return {
    assessedForEligibility: sum(flow),
    excludedBeforeRandomization: box(flow.filter((row) => row.status === 'excluded' && !isRandomized(row))),
    awaitingRandomization: { total: invited + screened + consented, invited, screened, consented },
    randomized: armFlows.reduce((total, arm) => total + arm.allocated, 0),
    arms: armFlows,
  };
}
