import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** One step done by one participant, checked by their completion code or by staff. */
@Entity({ name: 'step_completion' })
@Index('step_completion_enrollment_step_key', ['enrollmentId', 'stepId'], { unique: true })
export class StepCompletionEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'enrollment_id', type: 'uuid' })
  enrollmentId: string;

  @Column({ name: 'step_id', type: 'uuid' })
  stepId: string;

  @Column({ name: 'completed_at', type: 'timestamptz', default: () => 'now()' })
  completedAt: Date;

  @Column({ name: 'verified_by', type: 'text' })
  verifiedBy: 'code' | 'staff';

  @Column({ name: 'recorded_by', type: 'uuid', nullable: true })
  recordedBy: string | null;
}
