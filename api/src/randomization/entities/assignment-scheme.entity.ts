import { Column, Entity, JoinColumn, OneToOne, PrimaryColumn, UpdateDateColumn } from 'typeorm';
import type { StudyEntity } from '../../studies';

/**
 * A study's assignment scheme. `settings` is what the researcher chose; `sealedParameters` is the full canonical
 * parameter set frozen when the study opens, and `commitment` = SHA-256 over the seed and those parameters.
 * The seed itself stays sealed until closure or an audited unblinding.
 */
@Entity({ name: 'assignment_scheme' })
export class AssignmentSchemeEntity {
  @PrimaryColumn({ name: 'study_id', type: 'uuid' })
  studyId: string;

  // Named, not imported: studies loads the randomization engine, so a value import here would be a load-time cycle.
  @OneToOne('StudyEntity', { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'study_id' })
  study?: StudyEntity;

  @Column({ type: 'text' })
  method: string;

  @Column({ type: 'jsonb', default: () => "'{}'::jsonb" })
  settings: Record<string, unknown>;

  @Column({ name: 'sealed_parameters', type: 'jsonb', nullable: true })
  sealedParameters: Record<string, unknown> | null;

  @Column({ type: 'text', nullable: true, select: false })
  seed: string | null;

  @Column({ type: 'text', nullable: true })
  commitment: string | null;

  @Column({ name: 'committed_at', type: 'timestamptz', nullable: true })
  committedAt: Date | null;

  @Column({ name: 'seed_revealed_at', type: 'timestamptz', nullable: true })
  seedRevealedAt: Date | null;

  @Column({ name: 'unblinded_at', type: 'timestamptz', nullable: true })
  unblindedAt: Date | null;

  @Column({ name: 'unblinded_by', type: 'uuid', nullable: true })
  unblindedBy: string | null;

  @Column({ name: 'unblind_reason', type: 'text', nullable: true })
  unblindReason: string | null;

  /** Matched pairs: the cohort exactly as it was paired (enrollment and pretest), so verification can pair it again. */
  @Column({ name: 'paired_cohort', type: 'jsonb', nullable: true })
  pairedCohort: Array<{ enrollmentId: string; pretest: number }> | null;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
