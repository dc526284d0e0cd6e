import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import { bigintAsNumber } from '../../database/column-transformers';

export const PAYOUT_STATUSES = ['owed', 'approved', 'sending', 'paid', 'failed', 'cancelled', 'reversed'] as const;
export type PayoutStatus = (typeof PAYOUT_STATUSES)[number];

/** Money owed to one participant for one completed step (or a completion bonus), and its way to them. */
@Entity({ name: 'payout' })
@Index('payout_idempotency_key_key', ['idempotencyKey'], { unique: true })
export class PayoutEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'study_id', type: 'uuid' }) studyId: string;
  @Column({ name: 'enrollment_id', type: 'uuid' }) enrollmentId: string;
  @Column({ name: 'participant_id', type: 'uuid' }) participantId: string;
  /** The person's condition when the payout arose (null for within-subjects orders). */
  @Column({ name: 'condition_id', type: 'uuid', nullable: true }) conditionId: string | null;
  @Column({ name: 'step_completion_id', type: 'uuid', nullable: true }) stepCompletionId: string | null;
  @Column({ type: 'text' }) kind: 'step' | 'bonus';
  @Column({ name: 'amount_minor', type: 'bigint', transformer: bigintAsNumber }) amountMinor: number;
  @Column({ type: 'char', length: 3 }) currency: string;
  /** The step pays differently in this person's condition (a recorded override): flagged wherever it shows. */
  @Column({ name: 'pay_override', type: 'boolean', default: false }) payOverride: boolean;
  @Column({ type: 'text', default: 'owed' }) status: PayoutStatus;
  /** Sent as the provider's Idempotency-Key: a retried send can never make a second transfer. */
  @Column({ name: 'idempotency_key', type: 'text' }) idempotencyKey: string;
  @Column({ name: 'provider_transfer_id', type: 'text', nullable: true }) providerTransferId: string | null;
  /** Our own receipt number (study slug and a per-study count), given when paid: what participants see. */
  @Column({ name: 'receipt_number', type: 'text', nullable: true }) receiptNumber: string | null;
  @Column({ name: 'failure_reason', type: 'text', nullable: true }) failureReason: string | null;
  @Column({ type: 'integer', default: 0 }) attempts: number;
  @Column({ name: 'approved_by', type: 'uuid', nullable: true }) approvedBy: string | null;
  @Column({ name: 'approved_at', type: 'timestamptz', nullable: true }) approvedAt: Date | null;
  @Column({ name: 'sent_at', type: 'timestamptz', nullable: true }) sentAt: Date | null;
  @Column({ name: 'paid_at', type: 'timestamptz', nullable: true }) paidAt: Date | null;
  @Column({ name: 'reversed_at', type: 'timestamptz', nullable: true }) reversedAt: Date | null;
  @Column({ name: 'receipt_sent_at', type: 'timestamptz', nullable: true }) receiptSentAt: Date | null;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt: Date;
  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' }) updatedAt: Date;
}
