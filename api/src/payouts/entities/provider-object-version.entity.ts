import { Column, Entity, PrimaryColumn, UpdateDateColumn } from 'typeorm';

/** Per provider object (account, transfer, payment intent), the newest event applied to it: older ones change nothing. */
@Entity({ name: 'provider_object_version' })
export class ProviderObjectVersionEntity {
  @PrimaryColumn({ name: 'object_id', type: 'text' }) objectId: string;
  @Column({ name: 'object_type', type: 'text' }) objectType: string;
  @Column({ name: 'last_event_id', type: 'text' }) lastEventId: string;
  /** The provider's `created` of that event. */
  @Column({ name: 'last_event_created_at', type: 'timestamptz' }) lastEventCreatedAt: Date;
  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' }) updatedAt: Date;
}
