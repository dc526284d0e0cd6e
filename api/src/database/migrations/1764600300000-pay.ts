import { MigrationInterface, QueryRunner } from 'typeorm';

/** Step completions, what is owed and paid, payout accounts, provider events and study funding. */
export class Pay1764600300000 implements MigrationInterface {
  name = 'Pay1764600300000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE step ADD COLUMN completion_code_hash text NULL`);
    await queryRunner.query(
      `ALTER TABLE study ADD COLUMN completion_bonus_minor bigint NOT NULL DEFAULT 0 CHECK (completion_bonus_minor >= 0)`,
    );

    await queryRunner.query(`
      CREATE TABLE step_completion (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        enrollment_id uuid NOT NULL REFERENCES enrollment(id) ON DELETE RESTRICT,
        step_id uuid NOT NULL REFERENCES step(id) ON DELETE RESTRICT,
        completed_at timestamptz NOT NULL DEFAULT now(),
        verified_by text NOT NULL CHECK (verified_by IN ('code','staff')),
        recorded_by uuid NULL REFERENCES user_account(id) ON DELETE SET NULL
      )`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX step_completion_enrollment_step_key ON step_completion (enrollment_id, step_id)`,
    );

    await queryRunner.query(`
      CREATE TABLE payout (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        study_id uuid NOT NULL REFERENCES study(id) ON DELETE RESTRICT,
        enrollment_id uuid NOT NULL REFERENCES enrollment(id) ON DELETE RESTRICT,
        participant_id uuid NOT NULL REFERENCES user_account(id) ON DELETE RESTRICT,
        condition_id uuid NULL REFERENCES condition(id) ON DELETE RESTRICT,
        step_completion_id uuid NULL REFERENCES step_completion(id) ON DELETE RESTRICT,
        kind text NOT NULL CHECK (kind IN ('step','bonus')),
        amount_minor bigint NOT NULL CHECK (amount_minor >= 0),
        currency char(3) NOT NULL,
        pay_override boolean NOT NULL DEFAULT false,
        status text NOT NULL DEFAULT 'owed' CHECK (status IN ('owed','approved','sending','paid','failed','cancelled','reversed')),
        idempotency_key text NOT NULL,
        provider_transfer_id text NULL,
        failure_reason text NULL,
        attempts integer NOT NULL DEFAULT 0,
        approved_by uuid NULL REFERENCES user_account(id) ON DELETE SET NULL,
        approved_at timestamptz NULL,
        sent_at timestamptz NULL,
        paid_at timestamptz NULL,
        reversed_at timestamptz NULL,
        receipt_sent_at timestamptz NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);
    await queryRunner.query(`CREATE UNIQUE INDEX payout_idempotency_key_key ON payout (idempotency_key)`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX payout_step_completion_key ON payout (step_completion_id) WHERE step_completion_id IS NOT NULL AND status NOT IN ('cancelled','reversed')`,
    );
    await queryRunner.query(
      `CREATE UNIQUE INDEX payout_bonus_once_key ON payout (enrollment_id) WHERE kind = 'bonus' AND status NOT IN ('cancelled','reversed')`,
    );
    await queryRunner.query(
      `CREATE UNIQUE INDEX payout_provider_transfer_key ON payout (provider_transfer_id) WHERE provider_transfer_id IS NOT NULL`,
    );
    await queryRunner.query(`CREATE INDEX payout_study_status_idx ON payout (study_id, status)`);
    await queryRunner.query(`CREATE INDEX payout_enrollment_idx ON payout (enrollment_id)`);
    await queryRunner.query(
      `CREATE INDEX payout_participant_paid_idx ON payout (participant_id, paid_at) WHERE status = 'paid'`,
    );

    await queryRunner.query(`
      CREATE TABLE payout_account (
        user_id uuid PRIMARY KEY REFERENCES user_account(id) ON DELETE RESTRICT,
        provider_account_id text NOT NULL,
        payouts_enabled boolean NOT NULL DEFAULT false,
        onboarding_state text NOT NULL DEFAULT 'started' CHECK (onboarding_state IN ('started','complete')),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);
    await queryRunner.query(`CREATE UNIQUE INDEX payout_account_provider_key ON payout_account (provider_account_id)`);

    await queryRunner.query(`
      CREATE TABLE provider_event (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        provider_event_id text NOT NULL,
        type text NOT NULL,
        created_at_provider timestamptz NOT NULL,
        payload jsonb NOT NULL,
        received_at timestamptz NOT NULL DEFAULT now(),
        processed_at timestamptz NULL
      )`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX provider_event_provider_event_id_key ON provider_event (provider_event_id)`,
    );

    await queryRunner.query(`
      CREATE TABLE study_funding (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        study_id uuid NOT NULL REFERENCES study(id) ON DELETE RESTRICT,
        payment_intent_id text NOT NULL,
        amount_minor bigint NOT NULL CHECK (amount_minor > 0),
        currency char(3) NOT NULL,
        status text NOT NULL DEFAULT 'pending' CHECK (status IN ('pending','succeeded','failed')),
        created_by uuid NULL REFERENCES user_account(id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        succeeded_at timestamptz NULL
      )`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX study_funding_payment_intent_key ON study_funding (payment_intent_id)`,
    );
    await queryRunner.query(`CREATE INDEX study_funding_study_idx ON study_funding (study_id)`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    for (const table of ['study_funding', 'provider_event', 'payout_account', 'payout', 'step_completion']) {
      await queryRunner.query(`DROP TABLE ${table}`);
    }
    await queryRunner.query(`ALTER TABLE study DROP COLUMN completion_bonus_minor`);
    await queryRunner.query(`ALTER TABLE step DROP COLUMN completion_code_hash`);
  }
}
