import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Webhooks applied in the provider's order per object (the newest event applied for each object, so an older one
 * arriving late changes nothing), and an index for the sweep that settles payouts left `sending`.
 */
export class PayoutRecovery1764600850000 implements MigrationInterface {
  name = 'PayoutRecovery1764600850000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`
      CREATE TABLE provider_object_version (
        object_id text PRIMARY KEY,
        object_type text NOT NULL,
        last_event_id text NOT NULL,
        last_event_created_at timestamptz NOT NULL,
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);
    await queryRunner.query(`ALTER TABLE provider_event ADD COLUMN object_id text NULL`);
    await queryRunner.query(`ALTER TABLE provider_event ADD COLUMN applied boolean NOT NULL DEFAULT true`);
    await queryRunner.query(
      `CREATE INDEX provider_event_object_idx ON provider_event (object_id) WHERE object_id IS NOT NULL`,
    );
    await queryRunner.query(`CREATE INDEX payout_sending_since_idx ON payout (updated_at) WHERE status = 'sending'`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP INDEX payout_sending_since_idx`);
    await queryRunner.query(`DROP INDEX provider_event_object_idx`);
    await queryRunner.query(`ALTER TABLE provider_event DROP COLUMN applied`);
    await queryRunner.query(`ALTER TABLE provider_event DROP COLUMN object_id`);
    await queryRunner.query(`DROP TABLE provider_object_version`);
  }
}
