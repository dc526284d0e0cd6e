import { MigrationInterface, QueryRunner } from 'typeorm';

/** Conditions, steps and pay, stratification, the sealed assignment scheme, allocation slots and enrollments. */
export class StudyDesign1764600100000 implements MigrationInterface {
  name = 'StudyDesign1764600100000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE study ADD COLUMN summary text NOT NULL DEFAULT ''`);
    await queryRunner.query(
      `ALTER TABLE study ADD COLUMN estimated_minutes integer NULL CHECK (estimated_minutes IS NULL OR estimated_minutes > 0)`,
    );
    await queryRunner.query(`ALTER TABLE study ADD COLUMN opened_at timestamptz NULL`);
    await queryRunner.query(`ALTER TABLE study ADD COLUMN closed_at timestamptz NULL`);
    await queryRunner.query(
      `ALTER TABLE study ADD COLUMN created_by uuid NULL REFERENCES user_account(id) ON DELETE SET NULL`,
    );

    await queryRunner.query(`
      CREATE TABLE condition (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        study_id uuid NOT NULL REFERENCES study(id) ON DELETE CASCADE,
        code text NOT NULL,
        internal_name text NOT NULL,
        participant_label text NOT NULL,
        participant_instructions text NOT NULL DEFAULT '',
        allocation_weight integer NOT NULL DEFAULT 1 CHECK (allocation_weight BETWEEN 1 AND 100),
        position integer NOT NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX condition_study_name_key ON condition (study_id, lower(internal_name))`,
    );
    await queryRunner.query(`CREATE UNIQUE INDEX condition_study_code_key ON condition (study_id, code)`);

    await queryRunner.query(`
      CREATE TABLE step (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        study_id uuid NOT NULL REFERENCES study(id) ON DELETE CASCADE,
        position integer NOT NULL CHECK (position >= 1),
        title text NOT NULL,
        description text NOT NULL DEFAULT '',
        pay_minor bigint NOT NULL CHECK (pay_minor >= 0),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);
    await queryRunner.query(`CREATE UNIQUE INDEX step_study_position_key ON step (study_id, position)`);

    await queryRunner.query(`
      CREATE TABLE step_pay_override (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        step_id uuid NOT NULL REFERENCES step(id) ON DELETE CASCADE,
        condition_id uuid NOT NULL REFERENCES condition(id) ON DELETE CASCADE,
        pay_minor bigint NOT NULL CHECK (pay_minor >= 0),
        reason text NOT NULL,
        recorded_by uuid NULL REFERENCES user_account(id) ON DELETE SET NULL,
        recorded_at timestamptz NOT NULL DEFAULT now()
      )`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX step_pay_override_step_condition_key ON step_pay_override (step_id, condition_id)`,
    );

    await queryRunner.query(`
      CREATE TABLE stratification_factor (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        study_id uuid NOT NULL REFERENCES study(id) ON DELETE CASCADE,
        key text NOT NULL,
        label text NOT NULL,
        kind text NOT NULL CHECK (kind IN ('numeric','categorical')),
        cut_points jsonb NULL,
        categories jsonb NULL,
        minimization_weight numeric NOT NULL DEFAULT 1 CHECK (minimization_weight > 0),
        position integer NOT NULL
      )`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX stratification_factor_study_key_key ON stratification_factor (study_id, key)`,
    );

    await queryRunner.query(`
      CREATE TABLE assignment_scheme (
        study_id uuid PRIMARY KEY REFERENCES study(id) ON DELETE CASCADE,
        method text NOT NULL,
        settings jsonb NOT NULL DEFAULT '{}'::jsonb,
        sealed_parameters jsonb NULL,
        seed text NULL,
        commitment text NULL,
        committed_at timestamptz NULL,
        seed_revealed_at timestamptz NULL,
        unblinded_at timestamptz NULL,
        unblinded_by uuid NULL REFERENCES user_account(id) ON DELETE SET NULL,
        unblind_reason text NULL,
        paired_cohort jsonb NULL,
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT assignment_scheme_seed_format CHECK (seed IS NULL OR seed ~ '^[0-9a-f]{64}$')
      )`);

    await queryRunner.query(`
      CREATE TABLE enrollment (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        study_id uuid NOT NULL REFERENCES study(id) ON DELETE CASCADE,
        participant_id uuid NOT NULL REFERENCES user_account(id) ON DELETE RESTRICT,
        reference text NOT NULL,
        status text NOT NULL DEFAULT 'invited'
          CHECK (status IN ('invited','screened','excluded','consented','assigned','active','completed','withdrew','lost')),
        covariates jsonb NOT NULL DEFAULT '{}'::jsonb,
        stratum_key text NULL,
        condition_id uuid NULL REFERENCES condition(id) ON DELETE RESTRICT,
        condition_order jsonb NULL,
        exclusion_reason text NULL,
        withdrawal_reason text NULL,
        invited_at timestamptz NULL,
        screened_at timestamptz NULL,
        excluded_at timestamptz NULL,
        consented_at timestamptz NULL,
        assigned_at timestamptz NULL,
        completed_at timestamptz NULL,
        withdrew_at timestamptz NULL,
        lost_at timestamptz NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX enrollment_study_participant_key ON enrollment (study_id, participant_id)`,
    );
    await queryRunner.query(`CREATE UNIQUE INDEX enrollment_study_reference_key ON enrollment (study_id, reference)`);
    await queryRunner.query(`CREATE INDEX enrollment_study_status_idx ON enrollment (study_id, status)`);
    await queryRunner.query(`CREATE INDEX enrollment_participant_idx ON enrollment (participant_id)`);

    await queryRunner.query(`
      CREATE TABLE allocation_slot (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        study_id uuid NOT NULL REFERENCES study(id) ON DELETE CASCADE,
        stratum_key text NOT NULL,
        position integer NOT NULL CHECK (position >= 1),
        condition_id uuid NULL REFERENCES condition(id) ON DELETE RESTRICT,
        condition_order jsonb NULL,
        order_index integer NULL,
        block_index integer NULL,
        reserved_for uuid NULL REFERENCES enrollment(id) ON DELETE SET NULL,
        taken_by uuid NULL REFERENCES enrollment(id) ON DELETE RESTRICT,
        taken_at timestamptz NULL,
        CONSTRAINT allocation_slot_has_assignment CHECK (condition_id IS NOT NULL OR condition_order IS NOT NULL)
      )`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX allocation_slot_stratum_position_key ON allocation_slot (study_id, stratum_key, position)`,
    );
    await queryRunner.query(`CREATE UNIQUE INDEX allocation_slot_taken_by_key ON allocation_slot (taken_by)`);
    await queryRunner.query(`
      CREATE TABLE allocation (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        study_id uuid NOT NULL REFERENCES study(id) ON DELETE CASCADE,
        enrollment_id uuid NOT NULL REFERENCES enrollment(id) ON DELETE RESTRICT,
        sequence integer NOT NULL CHECK (sequence >= 1),
        stratum_key text NOT NULL,
        covariates jsonb NOT NULL,
        levels jsonb NOT NULL DEFAULT '{}'::jsonb,
        slot_id uuid NULL REFERENCES allocation_slot(id) ON DELETE RESTRICT,
        condition_id uuid NULL REFERENCES condition(id) ON DELETE RESTRICT,
        condition_order jsonb NULL,
        allocated_at timestamptz NOT NULL DEFAULT now()
      )`);
    // Arrival order across strata; taken under the stratum lock, so within a stratum it follows slot order.
    await queryRunner.query(`CREATE SEQUENCE allocation_sequence AS integer`);
    await queryRunner.query(`CREATE UNIQUE INDEX allocation_study_sequence_key ON allocation (study_id, sequence)`);
    await queryRunner.query(`CREATE UNIQUE INDEX allocation_enrollment_key ON allocation (enrollment_id)`);
    await queryRunner.query(
      `CREATE INDEX allocation_slot_next_free_idx ON allocation_slot (study_id, stratum_key, position) WHERE taken_by IS NULL`,
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE allocation`);
    await queryRunner.query(`DROP SEQUENCE allocation_sequence`);
    await queryRunner.query(`DROP TABLE allocation_slot`);
    await queryRunner.query(`DROP TABLE enrollment`);
    await queryRunner.query(`DROP TABLE assignment_scheme`);
    await queryRunner.query(`DROP TABLE stratification_factor`);
    await queryRunner.query(`DROP TABLE step_pay_override`);
    await queryRunner.query(`DROP TABLE step`);
    await queryRunner.query(`DROP TABLE condition`);
    for (const column of ['created_by', 'closed_at', 'opened_at', 'estimated_minutes', 'summary']) {
      await queryRunner.query(`ALTER TABLE study DROP COLUMN ${column}`);
    }
  }
}
