import { MigrationInterface, QueryRunner } from 'typeorm';

/** The ethics board's approval reference, kept apart from the lab's protocol number, and archiving of closed studies. */
export class StudyDetailsAndArchive1764700300000 implements MigrationInterface {
  name = 'StudyDetailsAndArchive1764700300000';

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`ALTER TABLE study ADD COLUMN ethics_approval_reference text NULL`);
    await queryRunner.query(`ALTER TABLE study ADD COLUMN archived_at timestamptz NULL`);
    await queryRunner.query(
      `ALTER TABLE study ADD CONSTRAINT study_archived_only_when_closed CHECK (archived_at IS NULL OR status = 'closed')`,
    );
    await queryRunner.query(`CREATE INDEX study_archived_at_idx ON study (archived_at)`);
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(`DROP INDEX study_archived_at_idx`);
    await queryRunner.query(`ALTER TABLE study DROP CONSTRAINT study_archived_only_when_closed`);
    await queryRunner.query(`ALTER TABLE study DROP COLUMN archived_at`);
    await queryRunner.query(`ALTER TABLE study DROP COLUMN ethics_approval_reference`);
  }
}
