import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import { ConditionEntity } from '../../studies';
import { bigintAsNumber } from '../../database/column-transformers';
import { StepEntity } from './step.entity';

/** A deliberate, recorded exception to equal pay: one step pays differently in one condition. Flagged wherever pay shows. */
@Entity({ name: 'step_pay_override' })
@Index('step_pay_override_step_condition_key', ['stepId', 'conditionId'], { unique: true })
export class StepPayOverrideEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'step_id', type: 'uuid' })
  stepId: string;

  @ManyToOne(() => StepEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'step_id' })
  step?: StepEntity;

  @Column({ name: 'condition_id', type: 'uuid' })
  conditionId: string;

  @ManyToOne(() => ConditionEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'condition_id' })
  condition?: ConditionEntity;

  @Column({ name: 'pay_minor', type: 'bigint', transformer: bigintAsNumber })
  payMinor: number;

  @Column({ type: 'text' })
  reason: string;

  @Column({ name: 'recorded_by', type: 'uuid', nullable: true })
  recordedBy: string | null;

  @Column({ name: 'recorded_at', type: 'timestamptz', default: () => 'now()' })
  recordedAt: Date;
}
