import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn } from 'typeorm';
import { bigintAsNumber } from '../../database/column-transformers';

/** Money put into a study's balance by card, as a payment intent at the provider. */
@Entity({ name: 'study_funding' })
export class StudyFundingEntity {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ name: 'study_id', type: 'uuid' }) studyId: string;
  @Column({ name: 'payment_intent_id', type: 'text' }) paymentIntentId: string;
  @Column({ name: 'amount_minor', type: 'bigint', transformer: bigintAsNumber }) amountMinor: number;
  @Column({ type: 'char', length: 3 }) currency: string;
  @Column({ type: 'text', default: 'pending' }) status: 'pending' | 'succeeded' | 'failed';
  @Column({ name: 'created_by', type: 'uuid', nullable: true }) createdBy: string | null;
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt: Date;
  @Column({ name: 'succeeded_at', type: 'timestamptz', nullable: true }) succeededAt: Date | null;
}
