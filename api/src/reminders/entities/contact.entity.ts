import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

export type ContactKind = 'invitation' | 'reminder' | 'reconsent-request' | 'staff-message';

/** One message the study sent a participant: the log the dropout watch compares across conditions. */
@Entity({ name: 'contact' })
@Index('contact_enrollment_sent_idx', ['enrollmentId', 'sentAt'])
export class ContactEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'study_id', type: 'uuid' })
  studyId: string;

  @Column({ name: 'enrollment_id', type: 'uuid' })
  enrollmentId: string;

  @Column({ type: 'text' })
  kind: ContactKind;

  @Column({ name: 'sent_at', type: 'timestamptz', default: () => 'now()' })
  sentAt: Date;

  @Column({ name: 'step_id', type: 'uuid', nullable: true })
  stepId: string | null;

  @Column({ type: 'text' })
  subject: string;

  @Column({ name: 'dedupe_key', type: 'text', nullable: true })
  dedupeKey: string | null;

  @Column({ name: 'sent_by', type: 'uuid', nullable: true })
  sentBy: string | null;
}
