import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** One pre-generated place in a stratum's reproducible sequence; taken by exactly one enrollment, in order. */
@Entity({ name: 'allocation_slot' })
@Index('allocation_slot_stratum_position_key', ['studyId', 'stratumKey', 'position'], { unique: true })
export class AllocationSlotEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'study_id', type: 'uuid' })
  studyId: string;

  @Column({ name: 'stratum_key', type: 'text' })
  stratumKey: string;

  @Column({ type: 'integer' })
  position: number;

  @Column({ name: 'condition_id', type: 'uuid', nullable: true })
  conditionId: string | null;

  @Column({ name: 'condition_order', type: 'jsonb', nullable: true })
  conditionOrder: string[] | null;

  @Column({ name: 'order_index', type: 'integer', nullable: true })
  orderIndex: number | null;

  @Column({ name: 'block_index', type: 'integer', nullable: true })
  blockIndex: number | null;

  /** Matched pairs: the cohort member this slot was decided for. */
  @Column({ name: 'reserved_for', type: 'uuid', nullable: true })
  reservedFor: string | null;

  @Column({ name: 'taken_by', type: 'uuid', nullable: true })
  takenBy: string | null;

  @Column({ name: 'taken_at', type: 'timestamptz', nullable: true })
  takenAt: Date | null;
}
