import { MigrationInterface, QueryRunner } from 'typeorm';

export class Foundation1764600000000 implements MigrationInterface {
  name = 'Foundation1764600000000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE EXTENSION IF NOT EXISTS pgcrypto`);
    await queryRunner.query(`
      CREATE TABLE user_account (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        email text NOT NULL,
        name text NOT NULL DEFAULT '',
        role text NOT NULL CHECK (role IN ('participant','coordinator','researcher','auditor','admin')),
        password_hash text NULL,
        active boolean NOT NULL DEFAULT true,
        last_sign_in_at timestamptz NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT user_account_email_lower CHECK (email = lower(email))
      )`);
    await queryRunner.query(`CREATE UNIQUE INDEX user_account_email_key ON user_account (email)`);

    await queryRunner.query(`
      CREATE TABLE sign_in_link (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        email text NOT NULL,
        token_hash text NOT NULL,
        study_slug text NULL,
        expires_at timestamptz NOT NULL,
        used_at timestamptz NULL,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await queryRunner.query(`CREATE UNIQUE INDEX sign_in_link_token_hash_key ON sign_in_link (token_hash)`);

    await queryRunner.query(`
      CREATE TABLE refresh_token (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        user_id uuid NOT NULL REFERENCES user_account(id) ON DELETE CASCADE,
        family_id uuid NOT NULL,
        token_hash text NOT NULL,
        expires_at timestamptz NOT NULL,
        replaced_at timestamptz NULL,
        revoked_at timestamptz NULL,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await queryRunner.query(`CREATE UNIQUE INDEX refresh_token_token_hash_key ON refresh_token (token_hash)`);
    await queryRunner.query(`CREATE INDEX refresh_token_family_idx ON refresh_token (family_id)`);

    await queryRunner.query(`
      CREATE TABLE study (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        slug text NOT NULL,
        title text NOT NULL,
        protocol_number text NULL,
        design text NOT NULL DEFAULT 'between' CHECK (design IN ('between','within')),
        status text NOT NULL DEFAULT 'draft' CHECK (status IN ('draft','recruiting','paused','closed')),
        target_size integer NULL CHECK (target_size IS NULL OR target_size > 0),
        budget_minor bigint NOT NULL DEFAULT 0 CHECK (budget_minor >= 0),
        currency char(3) NOT NULL DEFAULT 'USD',
        blinded boolean NOT NULL DEFAULT true,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);
    await queryRunner.query(`CREATE UNIQUE INDEX study_slug_key ON study (slug)`);

    await queryRunner.query(`
      CREATE TABLE study_membership (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        study_id uuid NOT NULL REFERENCES study(id) ON DELETE CASCADE,
        user_id uuid NOT NULL REFERENCES user_account(id) ON DELETE CASCADE,
        role text NOT NULL,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX study_membership_study_user_key ON study_membership (study_id, user_id)`,
    );
    await queryRunner.query(`CREATE INDEX study_membership_user_idx ON study_membership (user_id)`);

    await queryRunner.query(`
      CREATE TABLE audit_event (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        chain text NOT NULL,
        sequence integer NOT NULL CHECK (sequence >= 1),
        at timestamptz NOT NULL,
        actor_id uuid NULL,
        actor_email text NULL,
        action text NOT NULL,
        subject_type text NULL,
        subject_id text NULL,
        data jsonb NOT NULL DEFAULT '{}'::jsonb,
        previous_hash text NOT NULL,
        hash text NOT NULL
      )`);
    await queryRunner.query(`CREATE UNIQUE INDEX audit_event_chain_sequence_key ON audit_event (chain, sequence)`);
    await queryRunner.query(`CREATE INDEX audit_event_at_idx ON audit_event (at)`);
    // Append-only: the database itself refuses to change or remove a link of the chain.
    await queryRunner.query(`
      CREATE FUNCTION audit_event_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION 'audit_event is append-only';
      END $$`);
    await queryRunner.query(`
      CREATE TRIGGER audit_event_append_only BEFORE UPDATE OR DELETE ON audit_event
      FOR EACH ROW EXECUTE FUNCTION audit_event_refuse_change()`);

    await queryRunner.query(`
      CREATE TABLE rate_limit_window (
        key text PRIMARY KEY,
        hits integer NOT NULL,
        window_ends_at timestamptz NOT NULL,
        blocked_until timestamptz NULL
      )`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE rate_limit_window`);
    await queryRunner.query(`DROP TRIGGER audit_event_append_only ON audit_event`);
    await queryRunner.query(`DROP FUNCTION audit_event_refuse_change`);
    await queryRunner.query(`DROP TABLE audit_event`);
    await queryRunner.query(`DROP TABLE study_membership`);
    await queryRunner.query(`DROP TABLE study`);
    await queryRunner.query(`DROP TABLE refresh_token`);
    await queryRunner.query(`DROP TABLE sign_in_link`);
    await queryRunner.query(`DROP TABLE user_account`);
  }
}
