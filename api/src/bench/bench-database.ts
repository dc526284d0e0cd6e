import { Client } from 'pg';
import { DataSource } from 'typeorm';
import { dataSourceOptions } from '../database/data-source-options';

/** pg-boss keeps its tables here (see JobQueueService); the bench removes it only if it created it. */
const JOB_QUEUE_SCHEMA = 'job_queue';

/** A problem with how the benchmark was started: printed as a message, without a stack. */
export class BenchSetupError extends Error {}

/** A whole-number setting from the environment, within bounds, or the fallback when unset. */
export function wholeNumberSetting(name: string, fallback: number, min: number, max: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const value = Number(raw);
  if (!Number.isSafeInteger(value) || value < min || value > max) {
    throw new BenchSetupError(`${name} must be a whole number from ${min} to ${max} (got "${raw}")`);
  }
  return value;
}

export const DATABASE_URL_HELP = [
  'DATABASE_URL is not set. The benchmark needs a PostgreSQL database it may add a throwaway schema to; it starts nothing itself.',
  'Ways to get one:',
  '  - run `npm start` once (it starts the development PostgreSQL on 127.0.0.1:55432), then',
  '    DATABASE_URL=postgres://postgres@127.0.0.1:55432/evenhand npm run bench',
  '  - or `bash api/src/bench/run-with-local-postgres.sh`, which starts that same cluster if needed,',
  '    runs the benchmark in a database of its own and removes it afterwards.',
].join('\n');

/** A checked DATABASE_URL and one plain connection to it for set-up and clean-up, with messages a person can act on. */
export async function connectAdmin(databaseUrl: string): Promise<Client> {
  let parsed: URL;
  try {
    parsed = new URL(databaseUrl);
  } catch {
    throw new BenchSetupError('DATABASE_URL is not a valid URL (expected postgres://user@host:port/database)');
  }
  if (!['postgres:', 'postgresql:'].includes(parsed.protocol)) {
    throw new BenchSetupError(`DATABASE_URL must start with postgres:// (got ${parsed.protocol}//)`);
  }
  const admin = new Client({ connectionString: databaseUrl, application_name: 'evenhand-bench-admin' });
  try {
    await admin.connect();
  } catch (error) {
    throw new BenchSetupError(
      `Cannot connect to DATABASE_URL (${parsed.host}${parsed.pathname}): ${(error as Error).message}`,
    );
  }
  return admin;
}

/**
 * A schema of its own inside the given database, so the benchmark neither needs nor touches anything else
 * there. Every connection the app opens reaches it through `search_path` in the connection URL (pg passes
 * `options` to the server); `public` stays on the path for extensions installed there.
 */
export class BenchDatabase {
  readonly schema = `evenhand_bench_${process.pid}_${Date.now().toString(36)}`;
  readonly url: string;
  private createdJobQueue = false;

  private constructor(
    private readonly admin: Client,
    databaseUrl: string,
  ) {
    this.url = withSearchPath(databaseUrl, [this.schema, 'public'], 'evenhand-bench');
  }

  static async connect(databaseUrl: string): Promise<BenchDatabase> {
    const admin = await connectAdmin(databaseUrl);
    return new BenchDatabase(admin, databaseUrl);
  }

  /** Creates the schema and applies every migration in it, as `npm run migrate -w api` would. */
  async createAndMigrate(): Promise<void> {
    const [{ exists }] = (
      await this.admin.query(`SELECT EXISTS (SELECT 1 FROM pg_namespace WHERE nspname = $1) AS exists`, [
        JOB_QUEUE_SCHEMA,
      ])
    ).rows;
    this.createdJobQueue = !exists;
    await this.admin.query(`CREATE SCHEMA "${this.schema}"`);
    await applyMigrations(this.url);
  }

  async serverVersion(): Promise<string> {
    const [{ server_version }] = (await this.admin.query(`SHOW server_version`)).rows;
    return server_version;
  }

  /** Drops what this run created; safe to call more than once. */
  async dropAndDisconnect(): Promise<void> {
    try {
      await this.admin.query(`DROP SCHEMA IF EXISTS "${this.schema}" CASCADE`);
      if (this.createdJobQueue) await this.admin.query(`DROP SCHEMA IF EXISTS "${JOB_QUEUE_SCHEMA}" CASCADE`);
    } finally {
      await this.admin.end();
    }
  }
}

function withSearchPath(databaseUrl: string, schemas: string[], applicationName: string): string {
  const url = new URL(databaseUrl);
  const existing = url.searchParams.get('options');
  const searchPath = `-c search_path=${schemas.join(',')}`;
  url.searchParams.set('options', existing ? `${existing} ${searchPath}` : searchPath);
  if (!url.searchParams.has('application_name')) url.searchParams.set('application_name', applicationName);
  return url.toString();
}

/** Applies every migration to the database (and schema) the url names, as `npm run migrate -w api` would. */
export async function applyMigrations(url: string): Promise<void> {
  const migrator = new DataSource(dataSourceOptions(url));
  await migrator.initialize();
  try {
    await migrator.runMigrations({ transaction: 'each' });
  } finally {
    await migrator.destroy();
  }
}
