import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** Every webhook event received, once: the unique provider id turns duplicates into no-ops. */
@Entity({ name: 'provider_event' })
@Index('provider_event_provider_event_id_key', ['providerEventId'], { unique: true })
export class ProviderEventEntity {
  @PrimaryGeneratedColumn('uuid') id: string;
  @Column({ name: 'provider_event_id', type: 'text' }) providerEventId: string;
  @Column({ type: 'text' }) type: string;
  @Column({ name: 'created_at_provider', type: 'timestamptz' }) createdAtProvider: Date;
  @Column({ type: 'jsonb' }) payload: Record<string, unknown>;
  @Column({ name: 'received_at', type: 'timestamptz', default: () => 'now()' }) receivedAt: Date;
  @Column({ name: 'processed_at', type: 'timestamptz', nullable: true }) processedAt: Date | null;
  /** The id of the object the event is about, when it has one. */
  @Column({ name: 'object_id', type: 'text', nullable: true }) objectId: string | null;
  /** False when a newer event about the same object had already been applied, so this one changed nothing. */
  @Column({ type: 'boolean', default: true }) applied: boolean;
}
