import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * People who signed without being imported with a name get the name they typed as their roster name, as new
 * signers now do; the earliest signature's name is used.
 */
export class SignedNames1764700700000 implements MigrationInterface {
  name = 'SignedNames1764700700000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`
      UPDATE enrollment e SET display_name = first.typed_name
      FROM (SELECT DISTINCT ON (enrollment_id) enrollment_id, nullif(trim(typed_name), '') AS typed_name
              FROM signature ORDER BY enrollment_id, signed_at) first
      WHERE first.enrollment_id = e.id AND e.display_name IS NULL AND first.typed_name IS NOT NULL`);
  }

  async down(): Promise<void> {
    // Names filled in cannot be told apart from imported ones; nothing to undo.
  }
}
