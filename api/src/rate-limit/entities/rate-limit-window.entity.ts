import { Column, Entity, PrimaryColumn } from 'typeorm';

/** Hits per key in the current window; kept in PostgreSQL so every api instance shares the count. */
@Entity({ name: 'rate_limit_window' })
export class RateLimitWindowEntity {
  @PrimaryColumn({ type: 'text' })
  key: string;

  @Column({ type: 'integer' })
  hits: number;

  @Column({ name: 'window_ends_at', type: 'timestamptz' })
  windowEndsAt: Date;

  @Column({ name: 'blocked_until', type: 'timestamptz', nullable: true })
  blockedUntil: Date | null;
}
