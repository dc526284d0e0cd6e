import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

export const ENROLLMENT_STATUSES = [
  'invited',
  'screened',
  'excluded',
  'consented',
  'assigned',
  'active',
  'completed',
  'withdrew',
  'lost',
] as const;
export type EnrollmentStatus = (typeof ENROLLMENT_STATUSES)[number];

/** One person's part in one study, from invitation to completion or dropout. Never deleted. */
@Entity({ name: 'enrollment' })
@Index('enrollment_study_participant_key', ['studyId', 'participantId'], { unique: true })
export class EnrollmentEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'study_id', type: 'uuid' })
  studyId: string;

  @Column({ name: 'participant_id', type: 'uuid' })
  participantId: string;

  /** Pseudonymous reference used in exports and staff views instead of the person's e-mail. */
  @Column({ type: 'text' })
  reference: string;

  @Column({ type: 'text', default: 'invited' })
  status: EnrollmentStatus;

  @Column({ type: 'jsonb', default: () => "'{}'::jsonb" })
  covariates: Record<string, number | string | null>;

  @Column({ name: 'stratum_key', type: 'text', nullable: true })
  stratumKey: string | null;

  @Column({ name: 'condition_id', type: 'uuid', nullable: true })
  conditionId: string | null;

  @Column({ name: 'condition_order', type: 'jsonb', nullable: true })
  conditionOrder: string[] | null;

  @Column({ name: 'exclusion_reason', type: 'text', nullable: true })
  exclusionReason: string | null;

  @Column({ name: 'withdrawal_reason', type: 'text', nullable: true })
  withdrawalReason: string | null;

  @Column({ name: 'lost_reason', type: 'text', nullable: true })
  lostReason: string | null;

  @Column({ name: 'screening_answers', type: 'jsonb', nullable: true })
  screeningAnswers: Record<string, number | string | boolean> | null;

  /** The consent version this person last signed. */
  @Column({ name: 'signed_version_id', type: 'uuid', nullable: true })
  signedVersionId: string | null;

  /** Set when a newer consent version became active after they signed; cleared when they sign it. */
  @Column({ name: 'reconsent_requested_at', type: 'timestamptz', nullable: true })
  reconsentRequestedAt: Date | null;

  @Column({ name: 'invited_by', type: 'uuid', nullable: true })
  invitedBy: string | null;

  @Column({ name: 'invitation_sent_at', type: 'timestamptz', nullable: true })
  invitationSentAt: Date | null;

  /** Name as given on an imported roster (staff view only). */
  @Column({ name: 'display_name', type: 'text', nullable: true })
  displayName: string | null;

  @Column({ name: 'invited_at', type: 'timestamptz', nullable: true }) invitedAt: Date | null;
  @Column({ name: 'screened_at', type: 'timestamptz', nullable: true }) screenedAt: Date | null;
  @Column({ name: 'excluded_at', type: 'timestamptz', nullable: true }) excludedAt: Date | null;
  @Column({ name: 'consented_at', type: 'timestamptz', nullable: true }) consentedAt: Date | null;
  @Column({ name: 'assigned_at', type: 'timestamptz', nullable: true }) assignedAt: Date | null;
  @Column({ name: 'completed_at', type: 'timestamptz', nullable: true }) completedAt: Date | null;
  @Column({ name: 'withdrew_at', type: 'timestamptz', nullable: true }) withdrewAt: Date | null;
  @Column({ name: 'lost_at', type: 'timestamptz', nullable: true }) lostAt: Date | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
