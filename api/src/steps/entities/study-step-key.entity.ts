import { Column, Entity, PrimaryColumn } from 'typeorm';

/**
 * A study's secrets for step verification: one for per-participant codes (never rotated, so issued codes stay
 * valid) and one for return links, rotated with the previous key kept for a grace period.
 */
@Entity({ name: 'study_step_key' })
export class StudyStepKeyEntity {
  @PrimaryColumn({ name: 'study_id', type: 'uuid' })
  studyId: string;

  @Column({ name: 'code_key', type: 'text', select: false })
  codeKey: string;

  @Column({ name: 'return_key_id', type: 'integer', default: 1 })
  returnKeyId: number;

  @Column({ name: 'return_key', type: 'text', select: false })
  returnKey: string;

  @Column({ name: 'previous_return_key', type: 'text', nullable: true, select: false })
  previousReturnKey: string | null;

  @Column({ name: 'return_key_rotated_at', type: 'timestamptz', nullable: true })
  returnKeyRotatedAt: Date | null;

  @Column({ name: 'created_at', type: 'timestamptz', default: () => 'now()' })
  createdAt: Date;
}
