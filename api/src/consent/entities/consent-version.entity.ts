import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

export type ConsentVersionStatus = 'draft' | 'active' | 'retired';

/**
 * One version of a study's consent form. Drafts are edited freely; activation fixes the rendered text and its
 * SHA-256, and from then on the database refuses any change to the text or the approval letter.
 */
@Entity({ name: 'consent_version' })
@Index('consent_version_study_version_key', ['studyId', 'version'], { unique: true })
export class ConsentVersionEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'study_id', type: 'uuid' })
  studyId: string;

  @Column({ type: 'integer' })
  version: number;

  @Column({ name: 'template_id', type: 'text' })
  templateId: string;

  @Column({ name: 'template_values', type: 'jsonb', default: () => "'{}'::jsonb" })
  templateValues: Record<string, unknown>;

  /** Markdown, placeholders already filled. */
  @Column({ type: 'text' })
  body: string;

  @Column({ type: 'text', default: 'draft' })
  status: ConsentVersionStatus;

  @Column({ name: 'approval_reference', type: 'text', nullable: true })
  approvalReference: string | null;

  /** The ethics board's approval date (a calendar date, as written on the letter). */
  @Column({ name: 'approved_at', type: 'date', nullable: true })
  approvedAt: string | null;

  @Column({ name: 'approval_letter', type: 'bytea', nullable: true, select: false })
  approvalLetter: Buffer | null;

  @Column({ name: 'approval_letter_sha256', type: 'text', nullable: true })
  approvalLetterSha256: string | null;

  @Column({ name: 'approval_letter_name', type: 'text', nullable: true })
  approvalLetterName: string | null;

  @Column({ name: 'approval_letter_size', type: 'integer', nullable: true })
  approvalLetterSize: number | null;

  @Column({ name: 'rendered_text', type: 'text', nullable: true })
  renderedText: string | null;

  @Column({ type: 'text', nullable: true })
  fingerprint: string | null;

  @Column({ name: 'active_from', type: 'timestamptz', nullable: true })
  activeFrom: Date | null;

  @Column({ name: 'active_to', type: 'timestamptz', nullable: true })
  activeTo: Date | null;

  @Column({ name: 'created_by', type: 'uuid', nullable: true })
  createdBy: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
