import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Evidence an auditor can rely on: audit events name the key of their HMAC (NULL for events written before keys;
 * the api seals those once at start-up), audit receipts anchor the chain heads, allocation rows are append-only,
 * and an enrollment's condition and order must be the ones its allocation recorded.
 */
export class AuditEvidence1764600700000 implements MigrationInterface {
  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE audit_event ADD COLUMN key_id text NULL`);
    await queryRunner.query(`
      CREATE TABLE audit_receipt (
        id uuid PRIMARY KEY,
        number integer NOT NULL CHECK (number >= 1),
        issued_at timestamptz NOT NULL,
        reason text NOT NULL CHECK (reason IN ('scheduled', 'on-demand')),
        issued_by_email text NULL,
        key_id text NOT NULL,
        document jsonb NOT NULL,
        mac text NOT NULL
      )`);
    await queryRunner.query(`CREATE UNIQUE INDEX audit_receipt_number_key ON audit_receipt (number)`);
    await queryRunner.query(`
      CREATE TRIGGER audit_receipt_append_only BEFORE UPDATE OR DELETE ON audit_receipt
      FOR EACH ROW EXECUTE FUNCTION audit_event_refuse_change()`);

    await queryRunner.query(`
      CREATE FUNCTION allocation_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION 'allocation is append-only: the record of assignment cannot be changed or removed';
      END $$`);
    await queryRunner.query(`
      CREATE TRIGGER allocation_append_only BEFORE UPDATE OR DELETE ON allocation
      FOR EACH ROW EXECUTE FUNCTION allocation_refuse_change()`);

    // The enrollment carries a copy of its allocation (the dropout watch and exports read it). Once an allocation
    // exists, the copy may only ever equal it; before the copy is first written it may still be empty.
    await queryRunner.query(`
      CREATE FUNCTION enrollment_check_allocation() RETURNS trigger LANGUAGE plpgsql AS $$
      DECLARE
        recorded allocation%ROWTYPE;
        was_copied boolean := TG_OP = 'UPDATE' AND (OLD.condition_id IS NOT NULL OR OLD.condition_order IS NOT NULL);
        is_empty boolean := NEW.condition_id IS NULL AND NEW.condition_order IS NULL;
      BEGIN
        SELECT * INTO recorded FROM allocation WHERE enrollment_id = NEW.id;
        IF NOT FOUND OR (is_empty AND NOT was_copied) THEN
          RETURN NEW;
        END IF;
        IF NEW.condition_id IS DISTINCT FROM recorded.condition_id OR NEW.condition_order IS DISTINCT FROM recorded.condition_order THEN
          RAISE EXCEPTION 'enrollment % must keep the condition and order of its allocation %', NEW.id, recorded.id
            USING ERRCODE = 'check_violation';
        END IF;
        RETURN NEW;
      END $$`);
    await queryRunner.query(`
      CREATE TRIGGER enrollment_matches_allocation BEFORE INSERT OR UPDATE OF condition_id, condition_order ON enrollment
      FOR EACH ROW EXECUTE FUNCTION enrollment_check_allocation()`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TRIGGER enrollment_matches_allocation ON enrollment`);
    await queryRunner.query(`DROP FUNCTION enrollment_check_allocation`);
    await queryRunner.query(`DROP TRIGGER allocation_append_only ON allocation`);
    await queryRunner.query(`DROP FUNCTION allocation_refuse_change`);
    await queryRunner.query(`DROP TABLE audit_receipt`);
    await queryRunner.query(`ALTER TABLE audit_event DROP COLUMN key_id`);
  }
}
