import { Injectable, Logger, OnApplicationShutdown, OnModuleInit } from '@nestjs/common';
import PgBoss from 'pg-boss';
import type { EntityManager } from 'typeorm';
import { AppConfig } from '../config/app-config';
import { queryRows } from '../database/raw-query';
import { retryDelaySeconds } from './retry-delay';

export type JobHandler<Payload> = (payload: Payload, jobId: string) => Promise<void>;

/**
 * Runs every job of one fetch together (so their reads and writes can be batched) and answers, in the same order,
 * what became of each: `null` when it succeeded, or why it failed (that job alone is retried).
 */
export type JobBatchHandler<Payload> = (jobs: Array<{ payload: Payload; jobId: string }>) => Promise<unknown[]>;

export interface JobHandlerOptions<Payload> {
  /**
   * Told once when a job of this kind has failed its last try, with the last failure, so the work it stands for
   * can end somewhere (a payout becomes failed and retryable) instead of waiting for ever.
   */
  onGiveUp?: (payload: Payload, reason: string, jobId: string) => Promise<void>;
}

/** Every kind of background job, so names are not spread as strings. */
export const JOB_NAMES = {
  sendMail: 'mail.send',
  signedCopy: 'consent.signed-copy',
  sendPayout: 'payout.send',
  payoutReceipt: 'payout.receipt',
  sweepPayouts: 'payout.sweep',
  evaluateAttritionAlerts: 'attrition.evaluate-alerts',
  compactAttritionSummary: 'attrition.compact-summary',
  sweepReminders: 'reminders.sweep',
  auditReceipt: 'audit.receipt',
  signInLinkRequest: 'auth.sign-in-link',
  passwordResetRequest: 'auth.password-reset',
} as const;
/** Jobs fetched and run side by side per worker. */
export const JOB_BATCH_SIZE = 10;
/** Tries after the first before a job is given up. */
export const JOB_RETRY_LIMIT = 8;
export type JobName = (typeof JOB_NAMES)[keyof typeof JOB_NAMES];

/**
 * The PostgreSQL-backed job queue (pg-boss). Jobs are written in the same transaction as the change that causes
 * them, retried with capped back-off (retry-delay.ts; pg-boss 10's own back-off has no maximum), and handlers must
 * be idempotent because a job can run more than once.
 */
@Injectable()
export class JobQueueService implements OnModuleInit, OnApplicationShutdown {
  private readonly logger = new Logger('Jobs');
  private readonly boss: PgBoss;
  private started = false;

  constructor(private readonly config: AppConfig) {
    this.boss = new PgBoss({ connectionString: config.databaseUrl, schema: 'job_queue', max: 4 });
    this.boss.on('error', (error: Error) => this.logger.error(error.message));
  }

  async onModuleInit(): Promise<void> {
    await this.boss.start();
    for (const name of Object.values(JOB_NAMES)) {
      // Back-off is ours (see handle): pg-boss waits the base delay, and we move the retry to its capped time.
      const options = {
        name,
        retryLimit: JOB_RETRY_LIMIT,
        retryDelay: this.config.jobRetryDelaySeconds,
        retryBackoff: false,
      };
      await this.boss.createQueue(name, options);
      await this.boss.updateQueue(name, options); // queues made by an earlier release keep their old settings otherwise
    }
    this.started = true;
  }

  /** Registers the worker for a job kind; only processes with RUN_WORKERS=true pick up work. */
  async handle<Payload extends object>(
    name: JobName,
    handler: JobHandler<Payload>,
    options: JobHandlerOptions<Payload> = {},
  ): Promise<void> {
    await this.handleBatch<Payload>(
      name,
      async (jobs) =>
        (await Promise.allSettled(jobs.map((job) => handler(job.payload, job.jobId)))).map((result) =>
          result.status === 'rejected' ? result.reason : null,
        ),
      options,
    );
  }

  /** Like `handle`, but the handler gets each fetch's jobs together (see JobBatchHandler). */
  async handleBatch<Payload extends object>(
    name: JobName,
    handler: JobBatchHandler<Payload>,
    options: JobHandlerOptions<Payload> = {},
  ): Promise<void> {
    if (!this.config.runWorkers) return;
    // Up to 10 jobs per fetch run side by side; each failure is reported for its own job (retried with back-off),
    // and the worker then completes only the jobs still active, i.e. the ones that succeeded.
    // The worker id arrives only when `work` resolves; the handler may run before that.
    const worker: { id?: string } = {};
    worker.id = await this.boss.work<Payload>(
      name,
      { pollingIntervalSeconds: 0.5, batchSize: JOB_BATCH_SIZE, includeMetadata: true },
      async (jobs) => {
        // A full batch means more are waiting: fetch again at once instead of sleeping out the polling interval,
        // which would otherwise cap every kind of job at one batch per half second.
        if (jobs.length === JOB_BATCH_SIZE && worker.id) this.boss.notifyWorker(worker.id);
        let failures: unknown[];
        try {
          failures = await handler(jobs.map((job) => ({ payload: job.data, jobId: job.id })));
        } catch (error) {
          failures = jobs.map(() => error);
        }
        for (const [i, job] of jobs.entries()) {
          const failure = failures[i];
          if (failure !== null && failure !== undefined) await this.failed(name, job, failure, options);
        }
      },
    );
  }

  private async failed<Payload extends object>(
    name: JobName,
    job: PgBoss.JobWithMetadata<Payload>,
    error: unknown,
    options: JobHandlerOptions<Payload>,
  ): Promise<void> {
    const reason = error instanceof Error ? error.message : String(error);
    await this.boss.fail(name, job.id, { message: reason });
    if (job.retryCount < job.retryLimit) {
      const retry = job.retryCount + 1;
      const delay = retryDelaySeconds(retry, this.config.jobRetryDelaySeconds, this.config.jobRetryDelayMaxSeconds);
      this.logger.warn(
        `${name} job ${job.id} failed, retry ${retry} of ${job.retryLimit} in ${delay.toFixed(1)} s: ${reason}`,
      );
      await this.boss
        .getDb()
        .executeSql(
          `UPDATE job_queue.job SET start_after = now() + $3 * interval '1 second' WHERE name = $1 AND id = $2 AND state = 'retry'`,
          [name, job.id, delay],
        );
      return;
    }
    this.logger.warn(`${name} job ${job.id} failed its last try: ${reason}`);
    try {
      await options.onGiveUp?.(job.data, reason, job.id);
    } catch (giveUpError) {
      // The sweeper settles whatever this left unfinished.
      this.logger.error(`${name} job ${job.id}: giving up failed too: ${(giveUpError as Error).message}`);
    }
  }

  /** Enqueues inside the caller's transaction, so the job exists exactly when the change commits. */
  async enqueue<Payload extends object>(manager: EntityManager, name: JobName, payload: Payload): Promise<void> {
    await this.boss.send(name, payload, {
      db: { executeSql: async (text: string, values: unknown[]) => ({ rows: await queryRows(manager, text, values) }) },
    });
  }

  /** Enqueues many jobs of one kind inside the caller's transaction, a thousand rows per statement. */
  async enqueueMany<Payload extends object>(manager: EntityManager, name: JobName, payloads: Payload[]): Promise<void> {
    const db = {
      executeSql: async (text: string, values: unknown[]) => ({ rows: await queryRows(manager, text, values) }),
    };
    for (let i = 0; i < payloads.length; i += 1000) {
      await this.boss.insert(
        payloads.slice(i, i + 1000).map((data) => ({ name, data })),
        { db },
      );
    }
  }

  /** Sends a job of this kind on a cron schedule (UTC). pg-boss keeps one schedule per name, so every boot may call it. */
  async schedule(name: JobName, cron: string, payload: object = {}): Promise<void> {
    await this.boss.schedule(name, cron, payload, { tz: 'UTC' });
  }

  async unschedule(name: JobName): Promise<void> {
    await this.boss.unschedule(name);
  }

  async isReachable(): Promise<boolean> {
    if (!this.started) return false;
    try {
      await this.boss.getQueue(JOB_NAMES.sendMail);
      return true;
    } catch {
      return false;
    }
  }

  async onApplicationShutdown(): Promise<void> {
    if (this.started) await this.boss.stop({ graceful: true, timeout: 5000 });
  }
}
