import type { Client } from 'pg';
import { applyMigrations, BenchSetupError, connectAdmin } from './bench-database';

/**
 * A throwaway database on the server DATABASE_URL names, rather than a schema inside that database: signing
 * enqueues pg-boss jobs, and pg-boss keeps one `job_queue` schema per database whatever the search_path, so a
 * schema of our own would put these jobs in front of any api worker already polling that database.
 */
export class BenchOwnDatabase {
  readonly name = `evenhand_bench_${process.pid}_${Date.now().toString(36)}`;
  readonly url: string;

  private constructor(
    private readonly admin: Client,
    databaseUrl: string,
  ) {
    const url = new URL(databaseUrl);
    url.pathname = `/${this.name}`;
    if (!url.searchParams.has('application_name')) url.searchParams.set('application_name', 'evenhand-bench');
    this.url = url.toString();
  }

  static async create(databaseUrl: string): Promise<BenchOwnDatabase> {
    const admin = await connectAdmin(databaseUrl);
    const database = new BenchOwnDatabase(admin, databaseUrl);
    try {
      await admin.query(`CREATE DATABASE "${database.name}"`);
    } catch (error) {
      await admin.end();
      throw new BenchSetupError(
        `DATABASE_URL's user may not create a database (${(error as Error).message}); the signing benchmark needs one of its own`,
      );
    }
    return database;
  }

  /** Applies every migration, as `npm run migrate -w api` would. */
  migrate(): Promise<void> {
    return applyMigrations(this.url);
  }

  async serverVersion(): Promise<string> {
    const [{ server_version }] = (await this.admin.query(`SHOW server_version`)).rows;
    return server_version;
  }

  /** Drops the database (closing any connection left to it); safe to call more than once. */
  async dropAndDisconnect(): Promise<void> {
    try {
      await this.admin.query(`DROP DATABASE IF EXISTS "${this.name}" WITH (FORCE)`);
    } finally {
      await this.admin.end();
    }
  }
}
