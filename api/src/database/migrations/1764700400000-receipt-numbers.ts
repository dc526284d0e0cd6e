import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Our own receipt numbers for participants: the study's slug and a number counted per study in the order payouts
 * were paid (the provider's transfer id stays on the payout for staff and reconciliation).
 */
export class ReceiptNumbers1764700400000 implements MigrationInterface {
  name = 'ReceiptNumbers1764700400000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`
      CREATE TABLE payout_receipt_counter (
        study_id uuid PRIMARY KEY REFERENCES study(id),
        last_number integer NOT NULL
      )`);
    await queryRunner.query(`ALTER TABLE payout ADD COLUMN receipt_number text NULL`);
    await queryRunner.query(
      `CREATE UNIQUE INDEX payout_receipt_number_key ON payout (receipt_number) WHERE receipt_number IS NOT NULL`,
    );
    // Payouts paid before this change get their numbers in the order they were paid.
    await queryRunner.query(`
      WITH numbered AS (
        SELECT p.id, s.slug, row_number() OVER (PARTITION BY p.study_id ORDER BY p.paid_at, p.id) AS n
        FROM payout p JOIN study s ON s.id = p.study_id
        WHERE p.paid_at IS NOT NULL AND p.provider_transfer_id IS NOT NULL
      )
      UPDATE payout SET receipt_number = numbered.slug || '-' || lpad(numbered.n::text, 4, '0') FROM numbered WHERE payout.id = numbered.id`);
    await queryRunner.query(`
      INSERT INTO payout_receipt_counter (study_id, last_number)
      SELECT study_id, count(*) FROM payout WHERE receipt_number IS NOT NULL GROUP BY study_id`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP INDEX payout_receipt_number_key`);
    await queryRunner.query(`ALTER TABLE payout DROP COLUMN receipt_number`);
    await queryRunner.query(`DROP TABLE payout_receipt_counter`);
  }
}
