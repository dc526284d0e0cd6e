import { MigrationInterface, QueryRunner } from 'typeorm';

/** Screening questions, versioned consent forms with their approval letters, signatures and signed copies. */
export class ConsentAndEnrollment1764600200000 implements MigrationInterface {
  name = 'ConsentAndEnrollment1764600200000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE study ADD COLUMN lab_name text NOT NULL DEFAULT ''`);
    await queryRunner.query(`ALTER TABLE study ADD COLUMN contact_email text NULL`);

    await queryRunner.query(`
      CREATE TABLE screening_question (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        study_id uuid NOT NULL REFERENCES study(id) ON DELETE CASCADE,
        key text NOT NULL,
        label text NOT NULL,
        kind text NOT NULL CHECK (kind IN ('yes-no','number','choice')),
        options jsonb NULL,
        min_value numeric NULL,
        max_value numeric NULL,
        help text NOT NULL DEFAULT '',
        criterion text NULL,
        eligible_values jsonb NULL,
        eligible_min numeric NULL,
        eligible_max numeric NULL,
        position integer NOT NULL
      )`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX screening_question_study_key_key ON screening_question (study_id, key)`,
    );

    await queryRunner.query(`
      CREATE TABLE consent_version (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        study_id uuid NOT NULL REFERENCES study(id) ON DELETE RESTRICT,
        version integer NOT NULL CHECK (version >= 1),
        template_id text NOT NULL,
        template_values jsonb NOT NULL DEFAULT '{}'::jsonb,
        body text NOT NULL,
        status text NOT NULL DEFAULT 'draft' CHECK (status IN ('draft','active','retired')),
        approval_reference text NULL,
        approved_at date NULL,
        approval_letter bytea NULL,
        approval_letter_sha256 text NULL,
        approval_letter_name text NULL,
        approval_letter_size integer NULL,
        rendered_text text NULL,
        fingerprint text NULL,
        active_from timestamptz NULL,
        active_to timestamptz NULL,
        created_by uuid NULL REFERENCES user_account(id) ON DELETE SET NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT consent_version_active_is_fixed CHECK (status = 'draft' OR (fingerprint IS NOT NULL AND rendered_text IS NOT NULL AND approval_letter IS NOT NULL))
      )`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX consent_version_study_version_key ON consent_version (study_id, version)`,
    );
    await queryRunner.query(
      `CREATE UNIQUE INDEX consent_version_one_active_key ON consent_version (study_id) WHERE status = 'active'`,
    );
    // An approved form is evidence: once it has left draft its text may never change.
    await queryRunner.query(`
      CREATE FUNCTION consent_version_freeze_approved() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF TG_OP = 'DELETE' AND OLD.status <> 'draft' THEN RAISE EXCEPTION 'an approved consent version is never deleted'; END IF;
        IF TG_OP = 'UPDATE' AND OLD.status <> 'draft' AND (NEW.body IS DISTINCT FROM OLD.body OR NEW.rendered_text IS DISTINCT FROM OLD.rendered_text
            OR NEW.fingerprint IS DISTINCT FROM OLD.fingerprint OR NEW.approval_letter IS DISTINCT FROM OLD.approval_letter) THEN
          RAISE EXCEPTION 'an approved consent version cannot change';
        END IF;
        IF TG_OP = 'DELETE' THEN RETURN OLD; END IF;
        RETURN NEW;
      END $$`);
    await queryRunner.query(`
      CREATE TRIGGER consent_version_frozen BEFORE UPDATE OR DELETE ON consent_version
      FOR EACH ROW EXECUTE FUNCTION consent_version_freeze_approved()`);

    await queryRunner.query(`ALTER TABLE enrollment ADD COLUMN screening_answers jsonb NULL`);
    await queryRunner.query(
      `ALTER TABLE enrollment ADD COLUMN signed_version_id uuid NULL REFERENCES consent_version(id) ON DELETE RESTRICT`,
    );
    await queryRunner.query(`ALTER TABLE enrollment ADD COLUMN reconsent_requested_at timestamptz NULL`);
    await queryRunner.query(
      `ALTER TABLE enrollment ADD COLUMN invited_by uuid NULL REFERENCES user_account(id) ON DELETE SET NULL`,
    );
    await queryRunner.query(`ALTER TABLE enrollment ADD COLUMN invitation_sent_at timestamptz NULL`);
    await queryRunner.query(`ALTER TABLE enrollment ADD COLUMN display_name text NULL`);

    await queryRunner.query(`
      CREATE TABLE signature (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        enrollment_id uuid NOT NULL REFERENCES enrollment(id) ON DELETE RESTRICT,
        consent_version_id uuid NOT NULL REFERENCES consent_version(id) ON DELETE RESTRICT,
        typed_name text NOT NULL,
        mark text NULL,
        meaning text NOT NULL,
        signed_at timestamptz NOT NULL,
        time_zone text NULL,
        ip text NULL,
        user_agent text NULL,
        text_fingerprint text NOT NULL,
        pdf bytea NULL,
        pdf_sha256 text NULL,
        pdf_ready_at timestamptz NULL,
        copy_emailed_at timestamptz NULL
      )`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX signature_enrollment_version_key ON signature (enrollment_id, consent_version_id)`,
    );
    await queryRunner.query(`CREATE INDEX signature_version_idx ON signature (consent_version_id)`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE signature`);
    for (const column of [
      'display_name',
      'invitation_sent_at',
      'invited_by',
      'reconsent_requested_at',
      'signed_version_id',
      'screening_answers',
    ]) {
      await queryRunner.query(`ALTER TABLE enrollment DROP COLUMN ${column}`);
    }
    await queryRunner.query(`DROP TRIGGER consent_version_frozen ON consent_version`);
    await queryRunner.query(`DROP FUNCTION consent_version_freeze_approved`);
    await queryRunner.query(`DROP TABLE consent_version`);
    await queryRunner.query(`DROP TABLE screening_question`);
    await queryRunner.query(`ALTER TABLE study DROP COLUMN contact_email`);
    await queryRunner.query(`ALTER TABLE study DROP COLUMN lab_name`);
  }
}
