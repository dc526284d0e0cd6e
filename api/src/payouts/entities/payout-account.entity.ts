import { Column, CreateDateColumn, Entity, PrimaryColumn, UpdateDateColumn } from 'typeorm';

/** A participant's connected account at the payment provider. */
@Entity({ name: 'payout_account' })
export class PayoutAccountEntity {
  @PrimaryColumn({ name: 'user_id', type: 'uuid' }) userId: string;
  @Column({ name: 'provider_account_id', type: 'text' }) providerAccountId: string;
  @Column({ name: 'payouts_enabled', type: 'boolean', default: false }) payoutsEnabled: boolean;
  @Column({ name: 'onboarding_state', type: 'text', default: 'started' }) onboardingState: 'started' | 'complete';
  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' }) createdAt: Date;
  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' }) updatedAt: Date;
}
