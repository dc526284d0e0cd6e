import { Column, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** Name of the chain for events that belong to no single study. */
export const LAB_CHAIN = 'lab';

/**
 * One link of an append-only, hash-chained log. Each study has its own chain, lab-wide events
 * share the `lab` chain; `hash` = HMAC-SHA-256 under the key `keyId` over every other column (NULL keyId: an event
 * written before keys, hashed with plain SHA-256 and covered by a keyed seal), see audit-hash.ts.
 */
@Entity({ name: 'audit_event' })
@Index('audit_event_chain_sequence_key', ['chain', 'sequence'], { unique: true })
@Index('audit_event_at_idx', ['at'])
@Index('audit_event_subject_idx', ['subjectType', 'subjectId'])
@Index('audit_event_actor_idx', ['actorId', 'at'])
export class AuditEventEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'text' })
  chain: string;

  @Column({ type: 'integer' })
  sequence: number;

  @Column({ type: 'timestamptz' })
  at: Date;

  @Column({ name: 'actor_id', type: 'uuid', nullable: true })
  actorId: string | null;

  @Column({ name: 'actor_email', type: 'text', nullable: true })
  actorEmail: string | null;

  @Column({ type: 'text' })
  action: string;

  @Column({ name: 'subject_type', type: 'text', nullable: true })
  subjectType: string | null;

  @Column({ name: 'subject_id', type: 'text', nullable: true })
  subjectId: string | null;

  @Column({ type: 'jsonb', default: () => "'{}'::jsonb" })
  data: Record<string, unknown>;

  @Column({ name: 'previous_hash', type: 'text' })
  previousHash: string;

  @Column({ type: 'text' })
  hash: string;

  @Column({ name: 'key_id', type: 'text', nullable: true })
  keyId: string | null;
}
