import { MigrationInterface, QueryRunner } from 'typeorm';

/** Per-study dropout-watch alert rules, and for each rule whether it is crossed (so it e-mails once per crossing). */
export class AttritionAlerts1764600400000 implements MigrationInterface {
  name = 'AttritionAlerts1764600400000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`
      CREATE TABLE attrition_alert_rule (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        study_id uuid NOT NULL REFERENCES study(id) ON DELETE CASCADE,
        kind text NOT NULL CHECK (kind IN ('differential-attrition','log-rank','pay-difference')),
        enabled boolean NOT NULL DEFAULT true,
        comparison_condition_id text NULL,
        p_value_below double precision NULL CHECK (p_value_below IS NULL OR (p_value_below > 0 AND p_value_below < 1)),
        amount_minor bigint NULL CHECK (amount_minor IS NULL OR amount_minor >= 0),
        pay_basis text NULL CHECK (pay_basis IS NULL OR pay_basis IN ('paid','earned')),
        updated_by uuid NULL REFERENCES user_account(id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT attrition_alert_rule_threshold CHECK (
          (kind = 'differential-attrition' AND p_value_below IS NULL AND amount_minor IS NULL)
          OR (kind = 'log-rank' AND p_value_below IS NOT NULL)
          OR (kind = 'pay-difference' AND amount_minor IS NOT NULL AND pay_basis IS NOT NULL))
      )`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX attrition_alert_rule_study_kind_key ON attrition_alert_rule (study_id, kind)`,
    );

    await queryRunner.query(`
      CREATE TABLE attrition_alert_state (
        rule_id uuid PRIMARY KEY REFERENCES attrition_alert_rule(id) ON DELETE CASCADE,
        crossed boolean NOT NULL DEFAULT false,
        last_value double precision NULL,
        last_threshold double precision NULL,
        evaluated_at timestamptz NULL,
        crossed_at timestamptz NULL,
        notified_at timestamptz NULL,
        crossings integer NOT NULL DEFAULT 0 CHECK (crossings >= 0)
      )`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE attrition_alert_state`);
    await queryRunner.query(`DROP TABLE attrition_alert_rule`);
  }
}
