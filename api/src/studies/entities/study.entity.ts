import { bigintAsNumber } from '../../database/column-transformers';
import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';

export const STUDY_DESIGNS = ['between', 'within'] as const;
export type StudyDesign = (typeof STUDY_DESIGNS)[number];
export const STUDY_STATUSES = ['draft', 'recruiting', 'paused', 'closed'] as const;
export type StudyStatus = (typeof STUDY_STATUSES)[number];

@Entity({ name: 'study' })
@Index('study_slug_key', ['slug'], { unique: true })
export class StudyEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'text' })
  slug: string;

  @Column({ type: 'text' })
  title: string;

  @Column({ name: 'protocol_number', type: 'text', nullable: true })
  protocolNumber: string | null;

  @Column({ type: 'text', default: 'between' })
  design: StudyDesign;

  @Column({ type: 'text', default: 'draft' })
  status: StudyStatus;

  @Column({ name: 'target_size', type: 'integer', nullable: true })
  targetSize: number | null;

  /** Minor units of `currency`. */
  @Column({ name: 'budget_minor', type: 'bigint', default: 0, transformer: bigintAsNumber })
  budgetMinor: number;

  /** Paid once on completing every step; 0 for none. */
  @Column({ name: 'completion_bonus_minor', type: 'bigint', default: 0, transformer: bigintAsNumber })
  completionBonusMinor: number;

  @Column({ type: 'char', length: 3, default: 'USD' })
  currency: string;

  @Column({ type: 'boolean', default: true })
  blinded: boolean;

  @Column({ type: 'text', default: '' })
  summary: string;

  @Column({ name: 'estimated_minutes', type: 'integer', nullable: true })
  estimatedMinutes: number | null;

  @Column({ name: 'lab_name', type: 'text', default: '' })
  labName: string;

  @Column({ name: 'contact_email', type: 'text', nullable: true })
  contactEmail: string | null;

  /** The ethics board's approval reference; the protocol number is the lab's own reference. */
  @Column({ name: 'ethics_approval_reference', type: 'text', nullable: true })
  ethicsApprovalReference: string | null;

  /** Set on a closed study to take it out of the default lists; it can still be opened. */
  @Column({ name: 'archived_at', type: 'timestamptz', nullable: true })
  archivedAt: Date | null;

  @Column({ name: 'opened_at', type: 'timestamptz', nullable: true })
  openedAt: Date | null;

  @Column({ name: 'closed_at', type: 'timestamptz', nullable: true })
  closedAt: Date | null;

  @Column({ name: 'created_by', type: 'uuid', nullable: true })
  createdBy: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
