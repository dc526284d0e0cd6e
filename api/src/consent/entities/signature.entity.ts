import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** A participant's electronic signature on one consent version (21 CFR 11.50: printed name, time, meaning). */
@Entity({ name: 'signature' })
@Index('signature_enrollment_version_key', ['enrollmentId', 'consentVersionId'], { unique: true })
export class SignatureEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'enrollment_id', type: 'uuid' })
  enrollmentId: string;

  @Column({ name: 'consent_version_id', type: 'uuid' })
  consentVersionId: string;

  @Column({ name: 'typed_name', type: 'text' })
  typedName: string;

  /** The optional drawn mark as a PNG data URL. */
  @Column({ type: 'text', nullable: true })
  mark: string | null;

  @Column({ type: 'text' })
  meaning: string;

  @Column({ name: 'signed_at', type: 'timestamptz' })
  signedAt: Date;

  /** The signer's IANA time zone as their browser reported it, so the signed copy can show local time too. */
  @Column({ name: 'time_zone', type: 'text', nullable: true })
  timeZone: string | null;

  @Column({ type: 'text', nullable: true })
  ip: string | null;

  @Column({ name: 'user_agent', type: 'text', nullable: true })
  userAgent: string | null;

  @Column({ name: 'text_fingerprint', type: 'text' })
  textFingerprint: string;

  @Column({ type: 'bytea', nullable: true, select: false })
  pdf: Buffer | null;

  @Column({ name: 'pdf_sha256', type: 'text', nullable: true })
  pdfSha256: string | null;

  @Column({ name: 'pdf_ready_at', type: 'timestamptz', nullable: true })
  pdfReadyAt: Date | null;

  /** When the signer's copy went out, so a retried job never sends it twice. */
  @Column({ name: 'copy_emailed_at', type: 'timestamptz', nullable: true })
  copyEmailedAt: Date | null;
}
