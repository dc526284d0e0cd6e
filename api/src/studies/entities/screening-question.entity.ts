import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

const numeric = { to: (v: number | null) => v, from: (v: string | null) => (v === null ? null : Number(v)) };

export type ScreeningAnswer = number | string | boolean;

/** An eligibility question asked before consent; `eligible*` say which answers may take part. */
@Entity({ name: 'screening_question' })
@Index('screening_question_study_key_key', ['studyId', 'key'], { unique: true })
export class ScreeningQuestionEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'study_id', type: 'uuid' })
  studyId: string;

  @Column({ type: 'text' })
  key: string;

  @Column({ type: 'text' })
  label: string;

  @Column({ type: 'text' })
  kind: 'yes-no' | 'number' | 'choice';

  @Column({ type: 'jsonb', nullable: true })
  options: string[] | null;

  @Column({ name: 'min_value', type: 'numeric', nullable: true, transformer: numeric })
  minValue: number | null;

  @Column({ name: 'max_value', type: 'numeric', nullable: true, transformer: numeric })
  maxValue: number | null;

  @Column({ type: 'text', default: '' })
  help: string;

  /** The rule in plain words for the public study page, e.g. "18 or older". */
  @Column({ type: 'text', nullable: true })
  criterion: string | null;

  @Column({ name: 'eligible_values', type: 'jsonb', nullable: true })
  eligibleValues: Array<string | boolean> | null;

  @Column({ name: 'eligible_min', type: 'numeric', nullable: true, transformer: numeric })
  eligibleMin: number | null;

  @Column({ name: 'eligible_max', type: 'numeric', nullable: true, transformer: numeric })
  eligibleMax: number | null;

  @Column({ type: 'integer' })
  position: number;
}
