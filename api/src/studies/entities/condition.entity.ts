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
import { StudyEntity } from './study.entity';

/** One arm of a study. Participants only ever see the label and instructions, never the internal name. */
@Entity({ name: 'condition' })
@Index('condition_study_code_key', ['studyId', 'code'], { unique: true })
export class ConditionEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'study_id', type: 'uuid' })
  studyId: string;

  @ManyToOne(() => StudyEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'study_id' })
  study?: StudyEntity;

  /** Neutral code (A, B, C…) shown instead of the name while a study is blinded. */
  @Column({ type: 'text' })
  code: string;

  @Column({ name: 'internal_name', type: 'text' })
  internalName: string;

  @Column({ name: 'participant_label', type: 'text' })
  participantLabel: string;

  @Column({ name: 'participant_instructions', type: 'text', default: '' })
  participantInstructions: string;

  @Column({ name: 'allocation_weight', type: 'integer', default: 1 })
  allocationWeight: number;

  @Column({ type: 'integer' })
  position: number;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
