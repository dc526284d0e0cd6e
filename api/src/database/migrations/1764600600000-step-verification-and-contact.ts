import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * How each step is verified and when it can be done, the per-study keys behind return links and per-participant
 * codes, completions that can be undone with a reason, one reminder plan per study and the contact log.
 */
export class StepVerificationAndContact1764600600000 implements MigrationInterface {
  name = 'StepVerificationAndContact1764600600000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`
      ALTER TABLE step
        ADD COLUMN verification text NOT NULL DEFAULT 'staff'
          CHECK (verification IN ('return-link','participant-code','shared-code','staff')),
        ADD COLUMN task_url text NULL,
        ADD COLUMN opens_after_days integer NOT NULL DEFAULT 0 CHECK (opens_after_days BETWEEN 0 AND 3650),
        ADD COLUMN opens_from text NOT NULL DEFAULT 'assignment' CHECK (opens_from IN ('assignment','previous-step')),
        ADD COLUMN due_within_days integer NULL CHECK (due_within_days BETWEEN 0 AND 3650)`);
    await queryRunner.query(`UPDATE step SET verification = 'shared-code' WHERE completion_code_hash IS NOT NULL`);

    await queryRunner.query(`
      CREATE TABLE study_step_key (
        study_id uuid PRIMARY KEY REFERENCES study(id) ON DELETE CASCADE,
        code_key text NOT NULL,
        return_key_id integer NOT NULL DEFAULT 1,
        return_key text NOT NULL,
        previous_return_key text NULL,
        return_key_rotated_at timestamptz NULL,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);

    await queryRunner.query(`ALTER TABLE step_completion DROP CONSTRAINT IF EXISTS step_completion_verified_by_check`);
    await queryRunner.query(`UPDATE step_completion SET verified_by = 'shared-code' WHERE verified_by = 'code'`);
    await queryRunner.query(`
      ALTER TABLE step_completion
        ADD CONSTRAINT step_completion_verified_by_check
          CHECK (verified_by IN ('return-link','participant-code','shared-code','staff','staff-list')),
        ADD COLUMN evidence jsonb NOT NULL DEFAULT '{}'::jsonb,
        ADD COLUMN undone_at timestamptz NULL,
        ADD COLUMN undone_by uuid NULL REFERENCES user_account(id) ON DELETE SET NULL,
        ADD COLUMN undo_reason text NULL`);
    // An undone completion stays as history; the step can then be completed again.
    await queryRunner.query(`DROP INDEX step_completion_enrollment_step_key`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX step_completion_enrollment_step_key ON step_completion (enrollment_id, step_id) WHERE undone_at IS NULL`,
    );

    await queryRunner.query(`
      CREATE TABLE reminder_plan (
        study_id uuid PRIMARY KEY REFERENCES study(id) ON DELETE CASCADE,
        rules jsonb NOT NULL,
        suggest_lost_after integer NOT NULL DEFAULT 3 CHECK (suggest_lost_after BETWEEN 1 AND 50),
        enabled boolean NOT NULL DEFAULT true,
        updated_by uuid NULL REFERENCES user_account(id) ON DELETE SET NULL,
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);

    await queryRunner.query(`
      CREATE TABLE contact (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        study_id uuid NOT NULL REFERENCES study(id) ON DELETE CASCADE,
        enrollment_id uuid NOT NULL REFERENCES enrollment(id) ON DELETE CASCADE,
        kind text NOT NULL CHECK (kind IN ('invitation','reminder','reconsent-request','staff-message')),
        sent_at timestamptz NOT NULL DEFAULT now(),
        step_id uuid NULL REFERENCES step(id) ON DELETE SET NULL,
        subject text NOT NULL,
        dedupe_key text NULL,
        sent_by uuid NULL REFERENCES user_account(id) ON DELETE SET NULL
      )`);
    await queryRunner.query(`CREATE INDEX contact_enrollment_sent_idx ON contact (enrollment_id, sent_at)`);
    await queryRunner.query(`CREATE INDEX contact_study_idx ON contact (study_id)`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX contact_enrollment_dedupe_key ON contact (enrollment_id, dedupe_key) WHERE dedupe_key IS NOT NULL`,
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE contact`);
    await queryRunner.query(`DROP TABLE reminder_plan`);
    await queryRunner.query(`DELETE FROM step_completion WHERE undone_at IS NOT NULL`);
    await queryRunner.query(`DROP INDEX step_completion_enrollment_step_key`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX step_completion_enrollment_step_key ON step_completion (enrollment_id, step_id)`,
    );
    await queryRunner.query(`ALTER TABLE step_completion DROP CONSTRAINT step_completion_verified_by_check`);
    await queryRunner.query(
      `UPDATE step_completion SET verified_by = CASE WHEN verified_by IN ('staff','staff-list') THEN 'staff' ELSE 'code' END`,
    );
    await queryRunner.query(`
      ALTER TABLE step_completion
        ADD CONSTRAINT step_completion_verified_by_check CHECK (verified_by IN ('code','staff')),
        DROP COLUMN evidence, DROP COLUMN undone_at, DROP COLUMN undone_by, DROP COLUMN undo_reason`);
    await queryRunner.query(`DROP TABLE study_step_key`);
    await queryRunner.query(`
      ALTER TABLE step DROP COLUMN verification, DROP COLUMN task_url, DROP COLUMN opens_after_days,
        DROP COLUMN opens_from, DROP COLUMN due_within_days`);
  }
}
