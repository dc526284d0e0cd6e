import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The audit trail is read by participant (events about their enrollment or payouts) and by staff member (events they
 * made): indexes on the subject and the actor keep those filters from reading the whole trail. Indexes only; the
 * append-only trigger is untouched.
 */
export class AuditTrailLookups1764700100000 implements MigrationInterface {
  name = 'AuditTrailLookups1764700100000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`CREATE INDEX audit_event_subject_idx ON audit_event (subject_type, subject_id)`);
    await queryRunner.query(`CREATE INDEX audit_event_actor_idx ON audit_event (actor_id, at)`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP INDEX audit_event_actor_idx`);
    await queryRunner.query(`DROP INDEX audit_event_subject_idx`);
  }
}
