/**
 * The SQL behind the dropout watch, computed in full from the study's enrollments. Every figure is a GROUP BY in
 * PostgreSQL, so the rows that come back grow with the number of arms, statuses, days and covariate categories,
 * never with the number of participants. The report itself reads the same rows from the maintained summary
 * (attrition-summary-sql.ts); these full passes are the reference it is tested against, and the export.
 *
 * This is a read-only report across enrollment, payout, step and step_completion: the owning domains keep writing
 * them; attrition only aggregates, which no single domain's service could do without loading every row.
 */

import {
  splitFollowedGroups,
  type FlowRow,
  type FollowedGroupRow,
  type StratumSurvivalRow,
  type SurvivalRow,
} from './followed-groups';

export type { FlowRow, StratumSurvivalRow, SurvivalRow } from './followed-groups';

/** Runs one statement with positional parameters and returns its rows. */
export type SqlRunner = <Row>(sql: string, parameters: unknown[]) => Promise<Row[]>;

export type StudyDesign = 'between' | 'within';

/**
 * The arm of an enrollment: its condition in a between-subjects study (the uuid as stored, cheaper to group by;
 * queries turn it into text per group); in a within-subjects study the order it was given, as condition ids joined
 * by ">" (the form the assignment view uses).
 */
export function armExpression(design: StudyDesign, alias = 'e'): string {
  return design === 'within'
    ? `(SELECT string_agg(t.id, '>' ORDER BY t.position) FROM jsonb_array_elements_text(${alias}.condition_order) WITH ORDINALITY AS t(id, position))`
    : `${alias}.condition_id`;
}

/** Randomized: assigned, active, completed, withdrew or lost, or excluded after assignment (CONSORT 2010). */
export function randomizedPredicate(design: StudyDesign, alias = 'e'): string {
  const hasArm = design === 'within' ? `${alias}.condition_order IS NOT NULL` : `${alias}.condition_id IS NOT NULL`;
  return `(${alias}.status IN ('assigned','active','completed','withdrew','lost') OR (${alias}.status = 'excluded' AND ${alias}.assigned_at IS NOT NULL)) AND ${hasArm}`;
}

/** When follow-up ended: the dropout, the completion, or — still active — the censoring time given as $2. */
function followUpEnd(alias: string): string {
  return `CASE ${alias}.status
      WHEN 'withdrew' THEN coalesce(${alias}.withdrew_at, $2)
      WHEN 'lost' THEN coalesce(${alias}.lost_at, $2)
      WHEN 'excluded' THEN coalesce(${alias}.excluded_at, $2)
      WHEN 'completed' THEN coalesce(${alias}.completed_at, $2)
      ELSE $2 END`;
}

/**
 * Exact days from assignment to the end of follow-up, fractions included (never negative, in case of clock skew):
 * rounding to whole days would create ties that change the log-rank test.
 */
export function followUpDays(alias = 'e'): string {
  return `greatest(0, extract(epoch FROM (${followUpEnd(alias)}) - ${alias}.assigned_at) / 86400)::float8`;
}

/** Σ columns arrive as numeric text, Σ² columns as float8 numbers. */
export interface PayRow {
  arm: string;
  randomized: number;
  completed: number;
  paid_sum: string;
  paid_squares: number;
  paid_completer_sum: string;
  paid_completer_squares: number;
  earned_sum: string;
  earned_squares: number;
  earned_completer_sum: string;
  earned_completer_squares: number;
}

export interface CovariateRow {
  arm: string;
  key: string;
  kind: 'number' | 'string' | 'boolean';
  /** The category of a string or boolean covariate; null for numbers. */
  category: string | null;
  n: number;
  sum: number | null;
  squares: number | null;
  completer_n: number;
  completer_sum: number | null;
  completer_squares: number | null;
}

/** One step of the study's schedule, in order. */
export interface PlannedStepRow {
  opens_after_days: number;
  opens_from: 'assignment' | 'previous-step';
  due_within_days: number | null;
}

export interface AttritionAggregates {
  flow: FlowRow[];
  survival: SurvivalRow[];
  /** The same follow-up per randomization stratum, for the stratified tests. */
  strata: StratumSurvivalRow[];
  pay: PayRow[];
  /** The planned schedule, for the planned study length. */
  steps: PlannedStepRow[];
  covariates: CovariateRow[];
  payOverrideRecorded: boolean;
}

/**
 * Reads every aggregate of one study. Run it inside one REPEATABLE READ transaction so all figures come from the
 * same snapshot (the report cross-checks them); `censorAt` is the time still-active participants are censored at.
 */
export async function readAttritionAggregates(
  run: SqlRunner,
  study: { id: string; design: StudyDesign; currency: string; closed: boolean },
  censorAt: Date,
): Promise<AttritionAggregates> {
  const arm = armExpression(study.design);
  const randomized = randomizedPredicate(study.design);

  // One pass over the study's enrollments for both the CONSORT boxes (every enrollment by arm, status and reason) and
  // the dropout curves (randomized ones by exact days followed); the two are split apart in JavaScript.
  // Grouped by the arm as stored (a uuid between subjects) and turned into text only per group.
  const followed = await run<FollowedGroupRow>(
    `SELECT arm::text AS arm, status, assigned, reason, randomized, day, stratum, n
     FROM (SELECT ${arm} AS arm, e.status, (e.assigned_at IS NOT NULL) AS assigned,
                  CASE e.status WHEN 'excluded' THEN e.exclusion_reason WHEN 'withdrew' THEN e.withdrawal_reason WHEN 'lost' THEN e.lost_reason END AS reason,
                  r.randomized, CASE WHEN r.randomized THEN ${followUpDays('e')} END AS day,
                  CASE WHEN r.randomized THEN e.stratum_key END AS stratum,
                  count(*)::int AS n
           FROM enrollment e CROSS JOIN LATERAL (SELECT ${randomized} AS randomized) AS r
           WHERE e.study_id = $1
           GROUP BY 1, 2, 3, 4, 5, 6, 7) AS grouped`,
    [study.id, censorAt],
  );
  const { flow, survival, strata } = splitFollowedGroups(followed, study.closed);

  // Amounts per participant first, then count, Σ and Σ² per arm. Σ stays an exact integer; Σ² is float8, which is
  // what it becomes in JavaScript anyway, and several times faster than numeric over a million rows.
  const pay = await run<PayRow>(
    `WITH per_participant AS (
       SELECT p.enrollment_id,
              coalesce(sum(p.amount_minor) FILTER (WHERE p.status = 'paid'), 0)::bigint AS paid,
              coalesce(sum(p.amount_minor) FILTER (WHERE p.status IN ('owed','approved','sending','failed','paid')), 0)::bigint AS earned
       FROM payout p WHERE p.study_id = $1 AND p.currency = $2
       GROUP BY p.enrollment_id
     ), followed AS (
       SELECT ${arm} AS arm, e.status = 'completed' AS completed, coalesce(pp.paid, 0) AS paid, coalesce(pp.earned, 0) AS earned
       FROM enrollment e LEFT JOIN per_participant pp ON pp.enrollment_id = e.id
       WHERE e.study_id = $1 AND ${randomized}
     )
     SELECT arm::text AS arm, count(*)::int AS randomized, count(*) FILTER (WHERE completed)::int AS completed,
            sum(paid) AS paid_sum, sum(paid::float8 ^ 2) AS paid_squares,
            coalesce(sum(paid) FILTER (WHERE completed), 0) AS paid_completer_sum,
            coalesce(sum(paid::float8 ^ 2) FILTER (WHERE completed), 0) AS paid_completer_squares,
            sum(earned) AS earned_sum, sum(earned::float8 ^ 2) AS earned_squares,
            coalesce(sum(earned) FILTER (WHERE completed), 0) AS earned_completer_sum,
            coalesce(sum(earned::float8 ^ 2) FILTER (WHERE completed), 0) AS earned_completer_squares
     FROM followed GROUP BY arm`,
    [study.id, study.currency],
  );

  // Numbers are continuous covariates; strings and booleans become one binary indicator per category. Participants
  // with identical covariates are counted together first, so each distinct record is unpacked only once.
  const covariates = await run<CovariateRow>(
    `SELECT g.arm::text AS arm, c.key, jsonb_typeof(c.value) AS kind,
            CASE WHEN jsonb_typeof(c.value) = 'number' THEN NULL ELSE c.value #>> '{}' END AS category,
            sum(g.people)::int AS n, sum(g.people * v.x) AS sum, sum(g.people * v.x * v.x) AS squares,
            sum(g.completers)::int AS completer_n, sum(g.completers * v.x) AS completer_sum, sum(g.completers * v.x * v.x) AS completer_squares
     FROM (SELECT ${arm} AS arm, e.covariates, count(*) AS people, count(*) FILTER (WHERE e.status = 'completed') AS completers
           FROM enrollment e WHERE e.study_id = $1 AND ${randomized}
           GROUP BY 1, 2) AS g
     CROSS JOIN LATERAL jsonb_each(g.covariates) AS c(key, value)
     CROSS JOIN LATERAL (SELECT CASE WHEN jsonb_typeof(c.value) = 'number' THEN (c.value #>> '{}')::float8 END AS x) AS v
     WHERE jsonb_typeof(c.value) IN ('number','string','boolean')
     GROUP BY 1, 2, 3, 4`,
    [study.id],
  );

  return { flow, survival, strata, pay, covariates, ...(await readStudyPlan(run, study.id)) };
}

/** The planned schedule and whether any pay was overridden: small reads, shared by the full and the summary paths. */
export async function readStudyPlan(
  run: SqlRunner,
  studyId: string,
): Promise<{ steps: PlannedStepRow[]; payOverrideRecorded: boolean }> {
  // payout_pay_override_idx (partial) makes the payout half an index probe instead of a pass over the study's payouts.
  const [plan] = await run<{ recorded: boolean; steps: PlannedStepRow[] }>(
    `SELECT EXISTS (SELECT 1 FROM step_pay_override o JOIN step s ON s.id = o.step_id WHERE s.study_id = $1)
         OR EXISTS (SELECT 1 FROM payout p WHERE p.study_id = $1 AND p.pay_override) AS recorded,
            (SELECT coalesce(json_agg(json_build_object('opens_after_days', opens_after_days, 'opens_from', opens_from,
                                                       'due_within_days', due_within_days) ORDER BY position, id), '[]')
             FROM step WHERE study_id = $1) AS steps`,
    [studyId],
  );
  return { steps: plan.steps, payOverrideRecorded: plan.recorded };
}

/** The export's covariate columns: every key any enrollment of the study has, sorted. */
export async function readCovariateKeys(run: SqlRunner, studyId: string): Promise<string[]> {
  const rows = await run<{ key: string }>(
    `SELECT DISTINCT k.key FROM enrollment e CROSS JOIN LATERAL jsonb_object_keys(e.covariates) AS k(key) WHERE e.study_id = $1 ORDER BY 1`,
    [studyId],
  );
  return rows.map((row) => row.key);
}

export interface ExportRow {
  reference: string;
  arm: string | null;
  stratum_key: string | null;
  covariates: Record<string, unknown>;
  status: string;
  assigned_at: Date | null;
  completed_at: Date | null;
  dropped_out_at: Date | null;
  /** How the counting rule counts this person: completed, dropped, incomplete-at-close, still-active or not-randomized. */
  counted_as: string;
  steps_done: number;
  paid_minor: string;
  earned_minor: string;
}

/**
 * One page of the export, in reference order after `afterReference` (keyset paging on the unique
 * (study_id, reference) index, so each page costs the same however deep into the study it is).
 */
export function readExportPage(
  run: SqlRunner,
  study: { id: string; design: StudyDesign; currency: string; closedAt: Date | null },
  afterReference: string | null,
  pageSize: number,
): Promise<ExportRow[]> {
  return run<ExportRow>(
    `SELECT e.reference, ${armExpression(study.design)} AS arm, e.stratum_key, e.covariates, e.status, e.assigned_at, e.completed_at,
            CASE e.status WHEN 'withdrew' THEN e.withdrew_at WHEN 'lost' THEN e.lost_at
                          WHEN 'excluded' THEN CASE WHEN e.assigned_at IS NOT NULL THEN e.excluded_at END
                          WHEN 'assigned' THEN $5::timestamptz WHEN 'active' THEN $5::timestamptz END AS dropped_out_at,
            CASE WHEN NOT (${randomizedPredicate(study.design)}) THEN 'not-randomized'
                 WHEN e.status = 'completed' THEN 'completed'
                 WHEN e.status IN ('assigned','active') THEN CASE WHEN $5::timestamptz IS NULL THEN 'still-active' ELSE 'incomplete-at-close' END
                 ELSE 'dropped' END AS counted_as,
            (SELECT count(*)::int FROM step_completion sc WHERE sc.enrollment_id = e.id AND sc.undone_at IS NULL) AS steps_done,
            (SELECT coalesce(sum(p.amount_minor), 0)::text FROM payout p
              WHERE p.enrollment_id = e.id AND p.currency = $4 AND p.status = 'paid') AS paid_minor,
            (SELECT coalesce(sum(p.amount_minor), 0)::text FROM payout p
              WHERE p.enrollment_id = e.id AND p.currency = $4 AND p.status IN ('owed','approved','sending','failed','paid')) AS earned_minor
     FROM enrollment e
     WHERE e.study_id = $1 AND ($2::text IS NULL OR e.reference > $2)
     ORDER BY e.reference
     LIMIT $3`,
    [study.id, afterReference, pageSize, study.currency, study.closedAt],
  );
}

export interface ContactRow {
  arm: string;
  randomized: number;
  contacts_sum: number;
  contacts_squares: number;
  reminders: number;
  reconsent_requests: number;
  staff_messages: number;
}

/** Contacts sent after randomization (reminders, re-consent requests, staff messages) per participant, summed per arm. */
export async function readContactAggregates(
  run: SqlRunner,
  study: { id: string; design: StudyDesign },
): Promise<ContactRow[]> {
  const arm = armExpression(study.design);
  const rows = await run<ContactRow>(
    `WITH per_participant AS (
       SELECT ${arm} AS arm,
              count(c.id)::int AS contacts,
              count(c.id) FILTER (WHERE c.kind = 'reminder')::int AS reminders,
              count(c.id) FILTER (WHERE c.kind = 'reconsent-request')::int AS reconsent,
              count(c.id) FILTER (WHERE c.kind = 'staff-message')::int AS messages
       FROM enrollment e LEFT JOIN contact c ON c.enrollment_id = e.id AND c.kind <> 'invitation' AND c.sent_at >= e.assigned_at
       WHERE e.study_id = $1 AND ${randomizedPredicate(study.design)}
       GROUP BY e.id
     )
     SELECT arm::text AS arm, count(*)::int AS randomized, sum(contacts)::int AS contacts_sum, sum(contacts::float8 ^ 2) AS contacts_squares,
            sum(reminders)::int AS reminders, sum(reconsent)::int AS reconsent_requests, sum(messages)::int AS staff_messages
     FROM per_participant GROUP BY arm`,
    [study.id],
  );
  return rows.map((r) => ({ ...r, contacts_squares: Number(r.contacts_squares) }));
}
