import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Audit events wait here, written in the same transaction as the change they record, until their chain's chainer
 * seals them into audit_event (keyed hash, next sequence) in batches; a business transaction never takes a chain's
 * lock. Rows are deleted as they are sealed, in the sealing transaction.
 */
export class AuditOutbox1764700500000 implements MigrationInterface {
  name = 'AuditOutbox1764700500000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`
      CREATE TABLE audit_outbox (
        id bigserial PRIMARY KEY,
        chain text NOT NULL,
        actor_id uuid NULL,
        actor_email text NULL,
        action text NOT NULL,
        subject_type text NULL,
        subject_id text NULL,
        data jsonb NOT NULL DEFAULT '{}'::jsonb,
        recorded_at timestamptz NOT NULL DEFAULT now()
      )`);
    await queryRunner.query(`CREATE INDEX audit_outbox_chain_idx ON audit_outbox (chain, id)`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP TABLE audit_outbox`);
  }
}
