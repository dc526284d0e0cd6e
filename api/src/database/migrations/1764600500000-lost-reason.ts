import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Why someone was marked lost to follow-up, kept on the enrollment like the withdrawal reason, so the CONSORT flow
 * and the participant record can show it. Earlier marks are filled in from their audit events.
 */
export class LostReason1764600500000 implements MigrationInterface {
  name = 'LostReason1764600500000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE enrollment ADD COLUMN lost_reason text NULL`);
    await queryRunner.query(`
      UPDATE enrollment e SET lost_reason = nullif(trim(a.data->>'reason'), '')
      FROM audit_event a
      WHERE a.action = 'enrollment.lost' AND a.subject_type = 'enrollment' AND a.subject_id = e.id::text AND e.status = 'lost'`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE enrollment DROP COLUMN lost_reason`);
  }
}
