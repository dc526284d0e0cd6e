/**
 * The dropout watch read from its maintained summary (migration 1764700800000-attrition-summary): the same rows
 * `readAttritionAggregates` and `readContactAggregates` compute from the study's enrollments, summed from compacted
 * rows plus pending deltas, so the work grows with the number of distinct groups, not with participants.
 *
 * Follow-up still open (active people, or an end with no recorded time) is kept as the assignment time and ended at
 * `censorAt` here with the same expression the full computation uses, so censoring at "now" stays exact.
 * Run inside one REPEATABLE READ transaction: compaction moves rows between the tables read here.
 */

import { type AttritionAggregates, type ContactRow, type SqlRunner, readStudyPlan } from './attrition-sql';
import { type FollowedGroupRow, splitFollowedGroups } from './followed-groups';

const FOLLOWED = `(SELECT * FROM attrition_followed WHERE study_id = $1
                   UNION ALL SELECT * FROM attrition_followed_delta WHERE study_id = $1)`;

/** Each distinct profile of randomized people with how many share it (groups that cancelled out are dropped). */
const PROFILES = `profile AS MATERIALIZED (
  SELECT arm, completed, covariates, paid, earned, contacts, reminders, reconsent_requests, staff_messages, sum(n)::bigint AS n
  FROM (SELECT * FROM attrition_profile WHERE study_id = $1
        UNION ALL SELECT * FROM attrition_profile_delta WHERE study_id = $1) AS rows
  GROUP BY 1, 2, 3, 4, 5, 6, 7, 8, 9
  HAVING sum(n) <> 0)`;

export async function readSummaryAggregates(
  run: SqlRunner,
  study: { id: string; closed: boolean },
  censorAt: Date,
): Promise<{ aggregates: AttritionAggregates; contacts: ContactRow[] }> {
  const followed = await run<FollowedGroupRow>(
    `SELECT arm, status, assigned, reason, randomized, day, stratum, sum(n)::int AS n
     FROM (SELECT arm, status, assigned, reason, randomized, stratum, n,
                  CASE WHEN censor_from IS NULL THEN day
                       ELSE greatest(0, extract(epoch FROM $2::timestamptz - censor_from) / 86400)::float8 END AS day
           FROM ${FOLLOWED} AS rows) AS followed
     GROUP BY arm, status, assigned, reason, randomized, day, stratum
     HAVING sum(n) <> 0`,
    [study.id, censorAt],
  );
  const { flow, survival, strata } = splitFollowedGroups(followed, study.closed);

  // Pay, covariates and contacts come from the same profiles: one statement, one pass over them. Sums that the full
  // computation returns as numeric text stay text here; float8 travels through JSON unchanged (shortest exact form).
  const [profiles] = await run<{
    pay: AttritionAggregates['pay'];
    covariates: AttritionAggregates['covariates'];
    contacts: ContactRow[];
  }>(
    `WITH ${PROFILES}
     SELECT
       (SELECT coalesce(json_agg(p), '[]') FROM (
          SELECT arm, sum(n)::int AS randomized, coalesce(sum(n) FILTER (WHERE completed), 0)::int AS completed,
                 sum(n * paid)::text AS paid_sum, sum(n * paid::float8 ^ 2) AS paid_squares,
                 coalesce(sum(n * paid) FILTER (WHERE completed), 0)::text AS paid_completer_sum,
                 coalesce(sum(n * paid::float8 ^ 2) FILTER (WHERE completed), 0) AS paid_completer_squares,
                 sum(n * earned)::text AS earned_sum, sum(n * earned::float8 ^ 2) AS earned_squares,
                 coalesce(sum(n * earned) FILTER (WHERE completed), 0)::text AS earned_completer_sum,
                 coalesce(sum(n * earned::float8 ^ 2) FILTER (WHERE completed), 0) AS earned_completer_squares
          FROM profile GROUP BY arm) AS p) AS pay,
       -- The same unpacking as the full computation, over the same per-(arm, covariates) counts.
       (SELECT coalesce(json_agg(c), '[]') FROM (
          SELECT g.arm, c.key, jsonb_typeof(c.value) AS kind,
                 CASE WHEN jsonb_typeof(c.value) = 'number' THEN NULL ELSE c.value #>> '{}' END AS category,
                 sum(g.people)::int AS n, sum(g.people * v.x) AS sum, sum(g.people * v.x * v.x) AS squares,
                 sum(g.completers)::int AS completer_n, sum(g.completers * v.x) AS completer_sum,
                 sum(g.completers * v.x * v.x) AS completer_squares
          FROM (SELECT arm, covariates, sum(n)::bigint AS people, coalesce(sum(n) FILTER (WHERE completed), 0)::bigint AS completers
                FROM profile GROUP BY 1, 2) AS g
          CROSS JOIN LATERAL jsonb_each(g.covariates) AS c(key, value)
          CROSS JOIN LATERAL (SELECT CASE WHEN jsonb_typeof(c.value) = 'number' THEN (c.value #>> '{}')::float8 END AS x) AS v
          WHERE jsonb_typeof(c.value) IN ('number','string','boolean')
          GROUP BY 1, 2, 3, 4) AS c) AS covariates,
       (SELECT coalesce(json_agg(k), '[]') FROM (
          SELECT arm, sum(n)::int AS randomized, sum(n * contacts)::int AS contacts_sum,
                 sum(n * contacts::float8 ^ 2) AS contacts_squares, sum(n * reminders)::int AS reminders,
                 sum(n * reconsent_requests)::int AS reconsent_requests, sum(n * staff_messages)::int AS staff_messages
          FROM profile GROUP BY arm) AS k) AS contacts`,
    [study.id],
  );

  return {
    aggregates: {
      flow,
      survival,
      strata,
      pay: profiles.pay,
      covariates: profiles.covariates,
      ...(await readStudyPlan(run, study.id)),
    },
    contacts: profiles.contacts,
  };
}
