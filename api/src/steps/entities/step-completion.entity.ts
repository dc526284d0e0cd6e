import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';
import type { CompletionVerifiedBy } from '../step-window';

/** One step done by one participant, with how it was verified; undone completions stay as history. */
@Entity({ name: 'step_completion' })
@Index('step_completion_enrollment_step_key', ['enrollmentId', 'stepId'], { unique: true, where: 'undone_at IS NULL' })
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
  verifiedBy: CompletionVerifiedBy;

  @Column({ name: 'recorded_by', type: 'uuid', nullable: true })
  recordedBy: string | null;

  /** What showed the step was done: the return link's key id and expiry, the line of a staff list, and so on. */
  @Column({ type: 'jsonb', default: () => "'{}'::jsonb" })
  evidence: Record<string, unknown>;

  @Column({ name: 'undone_at', type: 'timestamptz', nullable: true })
  undoneAt: Date | null;

  @Column({ name: 'undone_by', type: 'uuid', nullable: true })
  undoneBy: string | null;

  @Column({ name: 'undo_reason', type: 'text', nullable: true })
  undoReason: string | null;
}
