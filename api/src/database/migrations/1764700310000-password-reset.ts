import { MigrationInterface, QueryRunner } from 'typeorm';

/** E-mailed password-reset links for staff: single use, short-lived, only the SHA-256 of the token kept. */
export class PasswordReset1764700310000 implements MigrationInterface {
  name = 'PasswordReset1764700310000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`
      CREATE TABLE password_reset (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        user_id uuid NOT NULL REFERENCES user_account (id) ON DELETE CASCADE,
        email text NOT NULL,
        token_hash text NOT NULL,
        expires_at timestamptz NOT NULL,
        used_at timestamptz NULL,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await queryRunner.query(`CREATE UNIQUE INDEX password_reset_token_hash_key ON password_reset (token_hash)`);
    await queryRunner.query(`CREATE INDEX password_reset_user_idx ON password_reset (user_id)`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE password_reset`);
  }
}
