import { ThrottlerStorage } from '@nestjs/throttler';
import { DataSource } from 'typeorm';

interface ThrottlerStorageRecord {
  totalHits: number;
  timeToExpire: number;
  isBlocked: boolean;
  timeToBlockExpire: number;
}

/**
 * Fixed-window hit counter kept in PostgreSQL, so that limits hold across every api instance
 * (the api keeps no state in memory). One upsert per hit; the row resets when its window has ended.
 */
export class PostgresThrottlerStorage implements ThrottlerStorage {
  constructor(private readonly dataSource: DataSource) {}

  async increment(key: string, ttlMilliseconds: number, limit: number): Promise<ThrottlerStorageRecord> {
    const [row] = await this.dataSource.query(
      `INSERT INTO rate_limit_window (key, hits, window_ends_at)
       VALUES ($1, 1, now() + $2 * interval '1 millisecond')
       ON CONFLICT (key) DO UPDATE SET
         hits = CASE WHEN rate_limit_window.window_ends_at <= now() THEN 1 ELSE rate_limit_window.hits + 1 END,
         window_ends_at = CASE WHEN rate_limit_window.window_ends_at <= now()
                               THEN EXCLUDED.window_ends_at ELSE rate_limit_window.window_ends_at END
       RETURNING hits, ceil(extract(epoch FROM window_ends_at - now()))::int AS seconds_left`,
      [key, ttlMilliseconds],
    );
    const totalHits = Number(row.hits);
    const secondsLeft = Math.max(1, Number(row.seconds_left));
    const isBlocked = totalHits > limit;
    return { totalHits, timeToExpire: secondsLeft, isBlocked, timeToBlockExpire: isBlocked ? secondsLeft : 0 };
  }

  /** Hits counted so far in the key's current window (0 once the window has ended). */
  async hitsInWindow(key: string): Promise<number> {
    const [row] = await this.dataSource.query(
      `SELECT hits FROM rate_limit_window WHERE key = $1 AND window_ends_at > now()`,
      [key],
    );
    return row ? Number(row.hits) : 0;
  }
}
