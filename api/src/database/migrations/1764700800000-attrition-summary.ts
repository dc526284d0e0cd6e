import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The dropout watch's maintained summary (issue 17). Each enrollment's contribution to the report is kept in
 * `attrition_enrollment_state`: its CONSORT box and follow-up (arm, status, reason, stratum, exact days followed, or
 * the assignment time when follow-up is still open and so ends at the report's "now"), and for the randomized its
 * covariates, paid and earned amounts in the study's currency and contacts after assignment. Whenever one changes,
 * the old contribution is subtracted and the new one added as insert-only delta rows (`attrition_followed_delta`,
 * `attrition_profile_delta`); `attrition_compact()` folds them into `attrition_followed` / `attrition_profile`,
 * and the report sums compacted rows and pending deltas in one snapshot.
 *
 * Why triggers: the figures move with writes from five domains (signing, withdrawal, steps, payouts, reminders) and
 * from direct SQL (imports, the demo history, repairs); a trigger runs in the same transaction as every one of
 * them, so the summary can never miss or double a change and no service has to remember to call anything. The
 * per-enrollment state row is locked while it is recomputed, which serialises changes to one person only; the
 * shared tables take inserts alone, so concurrent signings never wait on one hot row.
 *
 * No foreign keys here on purpose: the delete triggers must still find what a removed row contributed, and a key
 * check per delta row would lock the study row on every write.
 */
export class AttritionSummary1764700800000 implements MigrationInterface {
  name = 'AttritionSummary1764700800000';

  async up(queryRunner: QueryRunner): Promise<void> {
    const followedColumns = `study_id uuid NOT NULL, arm text NULL, status text NOT NULL, assigned boolean NOT NULL,
        reason text NULL, randomized boolean NOT NULL, stratum text NULL, day float8 NULL, censor_from timestamptz NULL,
        n integer NOT NULL`;
    const profileColumns = `study_id uuid NOT NULL, arm text NOT NULL, completed boolean NOT NULL, covariates jsonb NOT NULL,
        paid bigint NOT NULL, earned bigint NOT NULL, contacts integer NOT NULL, reminders integer NOT NULL,
        reconsent_requests integer NOT NULL, staff_messages integer NOT NULL, n integer NOT NULL`;
    await queryRunner.query(`CREATE TABLE attrition_followed (${followedColumns})`);
    await queryRunner.query(`CREATE TABLE attrition_followed_delta (${followedColumns})`);
    await queryRunner.query(`CREATE TABLE attrition_profile (${profileColumns})`);
    await queryRunner.query(`CREATE TABLE attrition_profile_delta (${profileColumns})`);
    for (const table of [
      'attrition_followed',
      'attrition_followed_delta',
      'attrition_profile',
      'attrition_profile_delta',
    ])
      await queryRunner.query(`CREATE INDEX ${table}_study_idx ON ${table} (study_id)`);
    await queryRunner.query(`
      CREATE TABLE attrition_enrollment_state (
        enrollment_id uuid PRIMARY KEY,
        study_id uuid NOT NULL,
        arm text NULL,
        status text NOT NULL,
        assigned boolean NOT NULL,
        reason text NULL,
        randomized boolean NOT NULL,
        stratum text NULL,
        day float8 NULL,
        censor_from timestamptz NULL,
        completed boolean NOT NULL,
        covariates jsonb NOT NULL,
        paid bigint NOT NULL,
        earned bigint NOT NULL,
        contacts integer NOT NULL,
        reminders integer NOT NULL,
        reconsent_requests integer NOT NULL,
        staff_messages integer NOT NULL
      )`);
    // The report's other full scan: "was any payout of this study paid at an overridden rate?".
    await queryRunner.query(`CREATE INDEX payout_pay_override_idx ON payout (study_id) WHERE pay_override`);

    // Same expressions as attrition-sql.ts (armExpression, randomizedPredicate, followUpDays), so the figures match.
    await queryRunner.query(`
      CREATE FUNCTION attrition_refresh(ids uuid[]) RETURNS void LANGUAGE plpgsql AS $fn$
      BEGIN
        -- Changes to one person wait for each other here (in id order, so two bulk statements cannot deadlock).
        PERFORM 1 FROM attrition_enrollment_state s JOIN (SELECT DISTINCT unnest(ids) AS id) AS w ON w.id = s.enrollment_id
        ORDER BY s.enrollment_id FOR UPDATE OF s;
        -- A new statement, so (READ COMMITTED) it sees whatever the transaction we may have waited for committed.
        WITH wanted AS (SELECT DISTINCT i.id FROM unnest(ids) AS i(id) WHERE i.id IS NOT NULL),
        current_state AS (
          SELECT e.id AS enrollment_id, e.study_id, a.arm, e.status, e.assigned_at IS NOT NULL AS assigned,
                 CASE e.status WHEN 'excluded' THEN e.exclusion_reason WHEN 'withdrew' THEN e.withdrawal_reason WHEN 'lost' THEN e.lost_reason END AS reason,
                 r.randomized,
                 CASE WHEN r.randomized THEN e.stratum_key END AS stratum,
                 CASE WHEN r.randomized AND (f.ended IS NOT NULL OR e.assigned_at IS NULL)
                      THEN greatest(0, extract(epoch FROM f.ended - e.assigned_at) / 86400)::float8 END AS day,
                 CASE WHEN r.randomized AND f.ended IS NULL THEN e.assigned_at END AS censor_from,
                 r.randomized AND e.status = 'completed' AS completed,
                 CASE WHEN r.randomized THEN e.covariates ELSE '{}'::jsonb END AS covariates,
                 pay.paid, pay.earned, con.contacts, con.reminders, con.reconsent_requests, con.staff_messages
          FROM wanted w
          JOIN enrollment e ON e.id = w.id
          JOIN study s ON s.id = e.study_id
          CROSS JOIN LATERAL (SELECT CASE WHEN s.design = 'within'
                 THEN (SELECT string_agg(t.id, '>' ORDER BY t.position) FROM jsonb_array_elements_text(e.condition_order) WITH ORDINALITY AS t(id, position))
                 ELSE e.condition_id::text END AS arm) a
          CROSS JOIN LATERAL (SELECT coalesce((e.status IN ('assigned','active','completed','withdrew','lost') OR (e.status = 'excluded' AND e.assigned_at IS NOT NULL))
                 AND CASE WHEN s.design = 'within' THEN e.condition_order IS NOT NULL ELSE e.condition_id IS NOT NULL END, false) AS randomized) r
          CROSS JOIN LATERAL (SELECT CASE e.status WHEN 'withdrew' THEN e.withdrew_at WHEN 'lost' THEN e.lost_at
                 WHEN 'excluded' THEN e.excluded_at WHEN 'completed' THEN e.completed_at END AS ended) f
          CROSS JOIN LATERAL (
            SELECT coalesce(sum(p.amount_minor) FILTER (WHERE p.status = 'paid'), 0)::bigint AS paid,
                   coalesce(sum(p.amount_minor) FILTER (WHERE p.status IN ('owed','approved','sending','failed','paid')), 0)::bigint AS earned
            FROM payout p WHERE r.randomized AND p.enrollment_id = e.id AND p.currency = s.currency) pay
          CROSS JOIN LATERAL (
            SELECT count(c.id)::int AS contacts,
                   count(c.id) FILTER (WHERE c.kind = 'reminder')::int AS reminders,
                   count(c.id) FILTER (WHERE c.kind = 'reconsent-request')::int AS reconsent_requests,
                   count(c.id) FILTER (WHERE c.kind = 'staff-message')::int AS staff_messages
            FROM contact c WHERE r.randomized AND c.enrollment_id = e.id AND c.kind <> 'invitation' AND c.sent_at >= e.assigned_at) con
        ),
        previous_state AS (SELECT s.* FROM attrition_enrollment_state s JOIN wanted w ON w.id = s.enrollment_id),
        gone AS (SELECT * FROM previous_state EXCEPT ALL SELECT * FROM current_state),
        came AS (SELECT * FROM current_state EXCEPT ALL SELECT * FROM previous_state),
        signed AS (SELECT *, -1 AS sign FROM gone UNION ALL SELECT *, 1 AS sign FROM came),
        followed AS (
          INSERT INTO attrition_followed_delta (study_id, arm, status, assigned, reason, randomized, stratum, day, censor_from, n)
          SELECT study_id, arm, status, assigned, reason, randomized, stratum, day, censor_from, sum(sign)::int
          FROM signed GROUP BY 1, 2, 3, 4, 5, 6, 7, 8, 9 HAVING sum(sign) <> 0),
        profile AS (
          INSERT INTO attrition_profile_delta (study_id, arm, completed, covariates, paid, earned, contacts, reminders, reconsent_requests, staff_messages, n)
          SELECT study_id, arm, completed, covariates, paid, earned, contacts, reminders, reconsent_requests, staff_messages, sum(sign)::int
          FROM signed WHERE randomized GROUP BY 1, 2, 3, 4, 5, 6, 7, 8, 9, 10 HAVING sum(sign) <> 0),
        removed AS (
          DELETE FROM attrition_enrollment_state s
          WHERE s.enrollment_id IN (SELECT enrollment_id FROM gone) AND s.enrollment_id NOT IN (SELECT enrollment_id FROM current_state))
        INSERT INTO attrition_enrollment_state SELECT * FROM came
        ON CONFLICT (enrollment_id) DO UPDATE SET
          (study_id, arm, status, assigned, reason, randomized, stratum, day, censor_from, completed, covariates, paid, earned,
           contacts, reminders, reconsent_requests, staff_messages) =
          (EXCLUDED.study_id, EXCLUDED.arm, EXCLUDED.status, EXCLUDED.assigned, EXCLUDED.reason, EXCLUDED.randomized,
           EXCLUDED.stratum, EXCLUDED.day, EXCLUDED.censor_from, EXCLUDED.completed, EXCLUDED.covariates, EXCLUDED.paid,
           EXCLUDED.earned, EXCLUDED.contacts, EXCLUDED.reminders, EXCLUDED.reconsent_requests, EXCLUDED.staff_messages);
      END
      $fn$`);

    // Statement-level triggers with transition tables: a bulk import refreshes its rows in one set-based pass.
    await queryRunner.query(`
      CREATE FUNCTION attrition_enrollment_changed() RETURNS trigger LANGUAGE plpgsql AS $fn$
      BEGIN
        IF TG_OP = 'INSERT' THEN
          PERFORM attrition_refresh(ARRAY(SELECT id FROM new_rows));
        ELSIF TG_OP = 'DELETE' THEN
          PERFORM attrition_refresh(ARRAY(SELECT id FROM old_rows));
        ELSE
          PERFORM attrition_refresh(ARRAY(
            SELECT n.id FROM new_rows n JOIN old_rows o ON o.id = n.id
            WHERE (n.study_id, n.status, n.condition_id, n.condition_order, n.assigned_at, n.completed_at, n.withdrew_at,
                   n.lost_at, n.excluded_at, n.exclusion_reason, n.withdrawal_reason, n.lost_reason, n.stratum_key, n.covariates)
               IS DISTINCT FROM
                  (o.study_id, o.status, o.condition_id, o.condition_order, o.assigned_at, o.completed_at, o.withdrew_at,
                   o.lost_at, o.excluded_at, o.exclusion_reason, o.withdrawal_reason, o.lost_reason, o.stratum_key, o.covariates)));
        END IF;
        RETURN NULL;
      END
      $fn$`);
    await queryRunner.query(`
      CREATE FUNCTION attrition_payout_changed() RETURNS trigger LANGUAGE plpgsql AS $fn$
      BEGIN
        IF TG_OP = 'INSERT' THEN
          PERFORM attrition_refresh(ARRAY(SELECT enrollment_id FROM new_rows));
        ELSIF TG_OP = 'DELETE' THEN
          PERFORM attrition_refresh(ARRAY(SELECT enrollment_id FROM old_rows));
        ELSE
          PERFORM attrition_refresh(ARRAY(
            SELECT unnest(ARRAY[n.enrollment_id, o.enrollment_id]) FROM new_rows n JOIN old_rows o ON o.id = n.id
            WHERE (n.enrollment_id, n.amount_minor, n.currency, n.status) IS DISTINCT FROM (o.enrollment_id, o.amount_minor, o.currency, o.status)));
        END IF;
        RETURN NULL;
      END
      $fn$`);
    await queryRunner.query(`
      CREATE FUNCTION attrition_contact_changed() RETURNS trigger LANGUAGE plpgsql AS $fn$
      BEGIN
        IF TG_OP = 'INSERT' THEN
          PERFORM attrition_refresh(ARRAY(SELECT enrollment_id FROM new_rows));
        ELSIF TG_OP = 'DELETE' THEN
          PERFORM attrition_refresh(ARRAY(SELECT enrollment_id FROM old_rows));
        ELSE
          PERFORM attrition_refresh(ARRAY(
            SELECT unnest(ARRAY[n.enrollment_id, o.enrollment_id]) FROM new_rows n JOIN old_rows o ON o.id = n.id
            WHERE (n.enrollment_id, n.kind, n.sent_at) IS DISTINCT FROM (o.enrollment_id, o.kind, o.sent_at)));
        END IF;
        RETURN NULL;
      END
      $fn$`);
    for (const [table, fn] of [
      ['enrollment', 'attrition_enrollment_changed'],
      ['payout', 'attrition_payout_changed'],
      ['contact', 'attrition_contact_changed'],
    ]) {
      await queryRunner.query(
        `CREATE TRIGGER ${table}_attrition_inserted AFTER INSERT ON ${table} REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION ${fn}()`,
      );
      await queryRunner.query(
        `CREATE TRIGGER ${table}_attrition_updated AFTER UPDATE ON ${table} REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION ${fn}()`,
      );
      await queryRunner.query(
        `CREATE TRIGGER ${table}_attrition_deleted AFTER DELETE ON ${table} REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION ${fn}()`,
      );
    }
    // The arm and the currency pay is counted in come from the study; both are fixed once anyone is assigned.
    await queryRunner.query(`
      CREATE FUNCTION attrition_study_changed() RETURNS trigger LANGUAGE plpgsql AS $fn$
      BEGIN
        PERFORM attrition_refresh(ARRAY(SELECT id FROM enrollment WHERE study_id = NEW.id));
        RETURN NULL;
      END
      $fn$`);
    await queryRunner.query(`
      CREATE TRIGGER study_attrition_updated AFTER UPDATE OF design, currency ON study FOR EACH ROW
      WHEN (OLD.design IS DISTINCT FROM NEW.design OR OLD.currency IS DISTINCT FROM NEW.currency)
      EXECUTE FUNCTION attrition_study_changed()`);

    // Folds pending deltas into the compacted rows of the studies they touch; one compaction at a time.
    await queryRunner.query(`
      CREATE FUNCTION attrition_compact() RETURNS void LANGUAGE plpgsql AS $fn$
      BEGIN
        PERFORM pg_advisory_xact_lock(hashtext('attrition_compact'));
        WITH moved AS (DELETE FROM attrition_followed_delta RETURNING *),
             touched AS (SELECT DISTINCT study_id FROM moved),
             kept AS (DELETE FROM attrition_followed f USING touched t WHERE f.study_id = t.study_id RETURNING f.*)
        INSERT INTO attrition_followed
        SELECT study_id, arm, status, assigned, reason, randomized, stratum, day, censor_from, sum(n)::int
        FROM (SELECT * FROM kept UNION ALL SELECT * FROM moved) AS rows
        GROUP BY 1, 2, 3, 4, 5, 6, 7, 8, 9 HAVING sum(n) <> 0;
        WITH moved AS (DELETE FROM attrition_profile_delta RETURNING *),
             touched AS (SELECT DISTINCT study_id FROM moved),
             kept AS (DELETE FROM attrition_profile p USING touched t WHERE p.study_id = t.study_id RETURNING p.*)
        INSERT INTO attrition_profile
        SELECT study_id, arm, completed, covariates, paid, earned, contacts, reminders, reconsent_requests, staff_messages, sum(n)::int
        FROM (SELECT * FROM kept UNION ALL SELECT * FROM moved) AS rows
        GROUP BY 1, 2, 3, 4, 5, 6, 7, 8, 9, 10 HAVING sum(n) <> 0;
      END
      $fn$`);

    // Backfill: every existing enrollment contributes once, then the deltas are folded.
    await queryRunner.query(`SELECT attrition_refresh(ARRAY(SELECT id FROM enrollment))`);
    await queryRunner.query(`SELECT attrition_compact()`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TRIGGER study_attrition_updated ON study`);
    for (const table of ['enrollment', 'payout', 'contact'])
      for (const event of ['inserted', 'updated', 'deleted'])
        await queryRunner.query(`DROP TRIGGER ${table}_attrition_${event} ON ${table}`);
    for (const fn of [
      'attrition_compact()',
      'attrition_study_changed()',
      'attrition_contact_changed()',
      'attrition_payout_changed()',
      'attrition_enrollment_changed()',
      'attrition_refresh(uuid[])',
    ])
      await queryRunner.query(`DROP FUNCTION ${fn}`);
    await queryRunner.query(`DROP INDEX payout_pay_override_idx`);
    for (const table of [
      'attrition_enrollment_state',
      'attrition_profile_delta',
      'attrition_profile',
      'attrition_followed_delta',
      'attrition_followed',
    ])
      await queryRunner.query(`DROP TABLE ${table}`);
  }
}
