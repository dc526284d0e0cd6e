import { Column, Entity, Index, PrimaryColumn } from 'typeorm';
import type { AuditReceiptDocument } from '../audit-receipt';

/** One audit receipt as issued (append-only); `document` is exactly what auditors received. */
@Entity({ name: 'audit_receipt' })
@Index('audit_receipt_number_key', ['number'], { unique: true })
export class AuditReceiptEntity {
  @PrimaryColumn('uuid')
  id: string;

  @Column({ type: 'integer' })
  number: number;

  @Column({ name: 'issued_at', type: 'timestamptz' })
  issuedAt: Date;

  @Column({ type: 'text' })
  reason: 'scheduled' | 'on-demand';

  @Column({ name: 'issued_by_email', type: 'text', nullable: true })
  issuedByEmail: string | null;

  @Column({ name: 'key_id', type: 'text' })
  keyId: string;

  @Column({ type: 'jsonb' })
  document: AuditReceiptDocument;

  @Column({ type: 'text' })
  mac: string;
}
