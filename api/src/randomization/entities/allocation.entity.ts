import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** The record of one assignment, in arrival order per study: what verification replays and compares. */
@Entity({ name: 'allocation' })
@Index('allocation_study_sequence_key', ['studyId', 'sequence'], { unique: true })
@Index('allocation_enrollment_key', ['enrollmentId'], { unique: true })
export class AllocationEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'study_id', type: 'uuid' })
  studyId: string;

  @Column({ name: 'enrollment_id', type: 'uuid' })
  enrollmentId: string;

  @Column({ type: 'integer' })
  sequence: number;

  @Column({ name: 'stratum_key', type: 'text' })
  stratumKey: string;

  @Column({ type: 'jsonb' })
  covariates: Record<string, number | string | null>;

  @Column({ type: 'jsonb', default: () => "'{}'::jsonb" })
  levels: Record<string, string>;

  @Column({ name: 'slot_id', type: 'uuid', nullable: true })
  slotId: string | null;

  @Column({ name: 'condition_id', type: 'uuid', nullable: true })
  conditionId: string | null;

  @Column({ name: 'condition_order', type: 'jsonb', nullable: true })
  conditionOrder: string[] | null;

  @Column({ name: 'allocated_at', type: 'timestamptz', default: () => 'now()' })
  allocatedAt: Date;
}
