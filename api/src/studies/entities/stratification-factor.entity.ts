import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import { StudyEntity } from './study.entity';

/** A screening answer that assignment balances on: numeric with cut points, or categorical. */
@Entity({ name: 'stratification_factor' })
@Index('stratification_factor_study_key_key', ['studyId', 'key'], { unique: true })
export class StratificationFactorEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'study_id', type: 'uuid' })
  studyId: string;

  @ManyToOne(() => StudyEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'study_id' })
  study?: StudyEntity;

  /** The covariate's key in a participant's answers, e.g. `sense_of_direction`. */
  @Column({ type: 'text' })
  key: string;

  /** The question as the participant reads it. */
  @Column({ type: 'text' })
  label: string;

  @Column({ type: 'text' })
  kind: 'numeric' | 'categorical';

  @Column({ name: 'cut_points', type: 'jsonb', nullable: true })
  cutPoints: number[] | null;

  @Column({ type: 'jsonb', nullable: true })
  categories: string[] | null;

  @Column({
    name: 'minimization_weight',
    type: 'numeric',
    default: 1,
    transformer: { to: (v: number) => v, from: (v: string) => Number(v) },
  })
  minimizationWeight: number;

  @Column({ type: 'integer' })
  position: number;
}
