import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Optional time-based one-time passwords for staff: the secret kept encrypted (AES-256-GCM), the last time step used
 * (so a code works once), recovery codes kept only as SHA-256 hashes, and the lab's one setting that requires it of
 * admins.
 */
export class TwoFactor1764700630000 implements MigrationInterface {
  name = 'TwoFactor1764700630000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`
      ALTER TABLE user_account
        ADD COLUMN two_factor_secret text NULL,
        ADD COLUMN two_factor_pending_secret text NULL,
        ADD COLUMN two_factor_enabled_at timestamptz NULL,
        ADD COLUMN two_factor_last_step bigint NULL`);
    await queryRunner.query(`
      CREATE TABLE two_factor_recovery_code (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        user_id uuid NOT NULL REFERENCES user_account (id) ON DELETE CASCADE,
        code_hash text NOT NULL,
        used_at timestamptz NULL,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX two_factor_recovery_code_hash_key ON two_factor_recovery_code (user_id, code_hash)`,
    );
    await queryRunner.query(`
      CREATE TABLE lab_setting (
        id boolean PRIMARY KEY DEFAULT true CHECK (id),
        two_factor_required_for_admins boolean NOT NULL DEFAULT false,
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);
    await queryRunner.query(`INSERT INTO lab_setting (id) VALUES (true)`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE lab_setting`);
    await queryRunner.query(`DROP TABLE two_factor_recovery_code`);
    await queryRunner.query(`
      ALTER TABLE user_account
        DROP COLUMN two_factor_secret,
        DROP COLUMN two_factor_pending_secret,
        DROP COLUMN two_factor_enabled_at,
        DROP COLUMN two_factor_last_step`);
  }
}
