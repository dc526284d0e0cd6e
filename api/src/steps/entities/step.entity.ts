import {
  Column,
  CreateDateColumn,
  Entity,
  Index,
  JoinColumn,
  ManyToOne,
  PrimaryGeneratedColumn,
  UpdateDateColumn,
} from 'typeorm';
import { StudyEntity } from '../../studies';

import { bigintAsNumber } from '../../database/column-transformers';
import type { StepOpensFrom, StepVerification } from '../step-window';

/** A unit of work a participant is paid for; the same pay in every condition unless an override is recorded. */
@Entity({ name: 'step' })
@Index('step_study_position_key', ['studyId', 'position'], { unique: true })
export class StepEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'study_id', type: 'uuid' })
  studyId: string;

  @ManyToOne(() => StudyEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'study_id' })
  study?: StudyEntity;

  @Column({ type: 'integer' })
  position: number;

  @Column({ type: 'text' })
  title: string;

  @Column({ type: 'text', default: '' })
  description: string;

  /** Minor units of the study's currency. */
  @Column({ name: 'pay_minor', type: 'bigint', transformer: bigintAsNumber })
  payMinor: number;

  /** How a completion is verified: see `StepVerification`. */
  @Column({ type: 'text', default: 'staff' })
  verification: StepVerification;

  /** The lab's external task (survey or experiment) for return-link steps. */
  @Column({ name: 'task_url', type: 'text', nullable: true })
  taskUrl: string | null;

  @Column({ name: 'opens_after_days', type: 'integer', default: 0 })
  opensAfterDays: number;

  @Column({ name: 'opens_from', type: 'text', default: 'assignment' })
  opensFrom: StepOpensFrom;

  /** Days after opening by which the step is due; null when it has no due date. */
  @Column({ name: 'due_within_days', type: 'integer', nullable: true })
  dueWithinDays: number | null;

  /** SHA-256 of the completion code shown at the end of the external task; the code itself is never stored. */
  @Column({ name: 'completion_code_hash', type: 'text', nullable: true, select: false })
  completionCodeHash: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
