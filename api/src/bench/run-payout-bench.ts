/**
 * `bash api/src/bench/run-payout-bench.sh` (or `node dist/bench/run-payout-bench.js` with DATABASE_URL, STRIPE_PORT
 * and SMTP_PORT pointing at running services): how fast do approved payouts get paid, compared with how fast the
 * payment provider (the local stand-in) creates bare transfers, measured in the same run? And is every payout paid
 * exactly once? See README.md beside this file.
 */
import 'reflect-metadata';
import type { INestApplication } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import { exitCodeFor, formatVerdicts, judge } from './bench-targets';
import { randomUUID } from 'node:crypto';
import { performance } from 'node:perf_hooks';
import type Stripe from 'stripe';
import { DataSource } from 'typeorm';
import { configureApp } from '../app-setup';
import { completeHostedOnboarding } from '../database/seed/hosted-onboarding';
import { AppModule } from '../app.module';
import type { SessionUser } from '../common/auth/session-user';
import { JOB_BATCH_SIZE } from '../jobs/job-queue.service';
import { PaymentsService } from '../payments/payments.service';
import { FundingService } from '../payouts/funding.service';
import { PayoutAccountsService } from '../payouts/payout-accounts.service';
import { PayoutApprovalService } from '../payouts/payout-approval.service';
import { PayoutQueueService } from '../payouts/payout-queue.service';
import { StepsService } from '../steps/steps.service';
import { StudiesService } from '../studies/studies.service';
import { BenchSetupError, DATABASE_URL_HELP, wholeNumberSetting } from './bench-database';
import { BenchOwnDatabase } from './bench-own-database';
import { formatTable, reportRow } from './bench-report';
import { abortOnInterrupt, runConcurrently, runBenchmark } from './concurrent-runner';

/** Issue 17: 10,000 payouts at no less than 0.7 × the provider's bare transfer creation, 0 doubles, 0 lost. */
const PAYOUT_TARGET = 0.7;

/** One US dollar a payout: the amount does not change the work, and the funding stays small. */
const PAYOUT_MINOR = 100;

const log = (line: string) => console.log(`[payout-bench] ${line}`);

async function until<T>(
  check: () => Promise<T | null>,
  what: string,
  timeoutMs: number,
  signal: AbortSignal,
): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    if (signal.aborted) throw new Error('interrupted');
    const value = await check();
    if (value !== null) return value;
    if (Date.now() > deadline) throw new Error(`timed out after ${Math.round(timeoutMs / 1000)} s waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

class PayoutBench {
  private readonly dataSource: DataSource;
  private readonly funding: FundingService;
  private readonly approval: PayoutApprovalService;
  private readonly accounts: PayoutAccountsService;
  private readonly queue: PayoutQueueService;
  private readonly provider: Stripe;
  private coordinator!: SessionUser;
  studyId = '';
  destinations: string[] = [];

  constructor(
    private readonly app: INestApplication,
    private readonly signal: AbortSignal,
  ) {
    this.dataSource = app.get(DataSource);
    this.funding = app.get(FundingService);
    this.approval = app.get(PayoutApprovalService);
    this.accounts = app.get(PayoutAccountsService);
    this.queue = app.get(PayoutQueueService);
    this.provider = app.get(PaymentsService).client;
  }

  /** A study with one step per payout a payee gets, created as the admin screens do. */
  async createStudy(stepsPerPayee: number): Promise<void> {
    const [row] = await this.dataSource.query(
      `INSERT INTO user_account (email, name, role) VALUES ('bench-coordinator@evenhand.test', 'Bench Coordinator', 'coordinator') RETURNING id, email, name, role`,
    );
    this.coordinator = row as SessionUser;
    const studies = this.app.get(StudiesService);
    const study = await studies.create(this.coordinator, {
      slug: 'bench-payouts',
      title: 'Payout benchmark study',
      design: 'between',
      protocolNumber: 'BENCH-PAY-1',
      labName: 'Quillmoor Benchmark Lab (invented)',
      estimatedMinutes: 30,
      targetSize: 1000,
    });
    this.studyId = study.id;
    for (const name of ['cue-a', 'cue-b'])
      await studies.createCondition(this.coordinator, study.id, {
        internalName: name,
        participantLabel: `Route guide ${name.slice(-1).toUpperCase()}`,
      });
    const steps = this.app.get(StepsService);
    for (let s = 1; s <= stepsPerPayee; s++)
      await steps.create(this.coordinator, study.id, { title: `Session ${s}`, payMinor: PAYOUT_MINOR });
  }

  /** Payees enrolled in the study, each with a provider account set up through the hosted onboarding page. */
  async onboardPayees(count: number): Promise<void> {
    const people: SessionUser[] = (
      await this.dataSource.query(
        `WITH made AS (
           INSERT INTO user_account (email, role)
           SELECT format('bench-payee-%s@example.test', g), 'participant' FROM generate_series(1, $1::int) g RETURNING id, email
         ), conditions AS (
           SELECT id, row_number() OVER (ORDER BY internal_name) - 1 AS k FROM condition WHERE study_id = $2
         ), enrolled AS (
           INSERT INTO enrollment (study_id, participant_id, reference, status, condition_id, screened_at, consented_at, assigned_at)
           SELECT $2::uuid, made.id, 'B-' || substr(made.id::text, 1, 8), 'active',
                  (SELECT id FROM conditions WHERE k = (hashtext(made.id::text) & 1)), now(), now(), now()
           FROM made RETURNING participant_id
         )
         SELECT made.id, made.email FROM made JOIN enrolled ON enrolled.participant_id = made.id ORDER BY made.email`,
        [count, this.studyId],
      )
    ).map(
      (r: { id: string; email: string }) =>
        ({ id: r.id, email: r.email, name: '', role: 'participant' }) as SessionUser,
    );
    await runConcurrently(
      people.length,
      JOB_BATCH_SIZE,
      async (i) => {
        const { url } = await this.accounts.startOnboarding(people[i]);
        await completeHostedOnboarding(url, 'Bench Payee');
        const status = await this.accounts.accountStatus(people[i]);
        if (!status.payoutsEnabled) throw new Error(`payee ${i + 1} finished onboarding but payouts are not enabled`);
      },
      this.signal,
    );
    this.destinations = (
      await this.dataSource.query(`SELECT provider_account_id FROM payout_account ORDER BY provider_account_id`)
    ).map((r: { provider_account_id: string }) => r.provider_account_id);
  }

  /** Every payee completes every step: one owed payout each, written as step completion would write them. */
  async owePayouts(): Promise<number> {
    await this.dataSource.query(
      `WITH done AS (
         INSERT INTO step_completion (enrollment_id, step_id, verified_by, recorded_by)
         SELECT e.id, s.id, 'staff', $2 FROM enrollment e CROSS JOIN step s WHERE e.study_id = $1 AND s.study_id = $1
         RETURNING id, enrollment_id
       )
       INSERT INTO payout (id, study_id, enrollment_id, participant_id, condition_id, step_completion_id, kind, amount_minor, currency, idempotency_key)
       SELECT x.id, e.study_id, e.id, e.participant_id, e.condition_id, x.completion_id, 'step', $3, st.currency, x.id::text
       FROM (SELECT gen_random_uuid() AS id, id AS completion_id, enrollment_id FROM done) x
       JOIN enrollment e ON e.id = x.enrollment_id JOIN study st ON st.id = e.study_id`,
      [this.studyId, this.coordinator.id, PAYOUT_MINOR],
    );
    const [{ n }] = await this.dataSource.query(
      `SELECT count(*)::int AS n FROM payout WHERE study_id = $1 AND status = 'owed'`,
      [this.studyId],
    );
    return n;
  }

  /** Funds the study as the card form does; the test card whose money is available at once. */
  async fundStudy(amountMinor: number): Promise<void> {
    const intent = await this.funding.createFunding(this.coordinator, this.studyId, amountMinor);
    await this.provider.paymentIntents.confirm(intent.clientSecret.split('_secret_')[0], {
      payment_method: 'pm_card_bypassPending',
    });
    const budget = await this.funding.refreshFunding(this.studyId, intent.fundingId);
    if (budget.fundedMinor < amountMinor)
      throw new Error(`funding did not land: funded ${budget.fundedMinor}, expected ${amountMinor}`);
  }

  /** Money on the platform for the baseline's transfers, outside any study. */
  async fundBaseline(amountMinor: number): Promise<void> {
    const intent = await this.provider.paymentIntents.create({
      amount: amountMinor,
      currency: 'usd',
      allowed_payment_method_types: ['card'],
      metadata: { purpose: 'bench-baseline' },
    });
    const confirmed = await this.provider.paymentIntents.confirm(intent.id, {
      payment_method: 'pm_card_bypassPending',
    });
    if (confirmed.status !== 'succeeded') throw new Error(`the baseline top-up ended ${confirmed.status}`);
  }

  /**
   * The provider's own rate: bare transfer creations through the same SDK client, at the concurrency our sender
   * runs (one batch of jobs side by side), each with a fresh Idempotency-Key as ours carry.
   */
  baseline(count: number) {
    return runConcurrently(
      count,
      JOB_BATCH_SIZE,
      (i) =>
        this.provider.transfers.create(
          {
            amount: PAYOUT_MINOR,
            currency: 'usd',
            destination: this.destinations[i % this.destinations.length],
            transfer_group: 'bench_baseline',
            metadata: { baseline: String(i) },
          },
          { idempotencyKey: randomUUID() },
        ),
      this.signal,
    );
  }

  /** Approves every owed payout in one go, then waits for the job workers to have paid them all. */
  async payEverything(
    count: number,
  ): Promise<{ approveSeconds: number; totalSeconds: number; perSecond: number; attempts: Record<string, number> }> {
    const ids: string[] = (
      await this.dataSource.query(`SELECT id FROM payout WHERE study_id = $1 AND status = 'owed'`, [this.studyId])
    ).map((r: { id: string }) => r.id);
    const started = performance.now();
    const approval = await this.approval.approve(this.coordinator, this.studyId, ids);
    if (approval.approved !== count) throw new Error(`approved ${approval.approved} of ${count}`);
    const approveSeconds = (performance.now() - started) / 1000;
    log(`approved ${count} in ${approveSeconds.toFixed(1)} s; waiting for the senders`);
    let lastReport = performance.now();
    await until(
      async () => {
        const [row] = await this.dataSource.query(
          `SELECT count(*) FILTER (WHERE status = 'paid')::int AS paid, count(*) FILTER (WHERE status = 'failed')::int AS failed, min(failure_reason) AS reason
           FROM payout WHERE study_id = $1`,
          [this.studyId],
        );
        if (row.failed > 0) throw new Error(`${row.failed} payout(s) failed: ${row.reason}`);
        if (performance.now() - lastReport > 10_000) {
          lastReport = performance.now();
          log(`  ${row.paid} of ${count} paid after ${((lastReport - started) / 1000).toFixed(0)} s`);
        }
        return row.paid === count ? row : null;
      },
      'every payout to be paid',
      30 * 60_000,
      this.signal,
    );
    const totalSeconds = (performance.now() - started) / 1000;
    const attempts: Record<string, number> = {};
    for (const r of await this.dataSource.query(
      `SELECT attempts, count(*)::int AS n FROM payout WHERE study_id = $1 GROUP BY attempts ORDER BY attempts`,
      [this.studyId],
    )) {
      attempts[r.attempts] = r.n;
    }
    return { approveSeconds, totalSeconds, perSecond: count / totalSeconds, attempts };
  }

  /** What the provider holds for this study, against our ledger: one transfer per payout, nothing else. */
  async exactlyOnce() {
    const transfers: Stripe.Transfer[] = [];
    for await (const transfer of this.provider.transfers.list({ transfer_group: `study_${this.studyId}`, limit: 100 }))
      transfers.push(transfer);
    const perPayout = new Map<string, number>();
    for (const t of transfers)
      perPayout.set(t.metadata?.payoutId ?? '(none)', (perPayout.get(t.metadata?.payoutId ?? '(none)') ?? 0) + 1);
    const duplicates = [...perPayout.values()].reduce((sum, n) => sum + (n - 1), 0);
    const [ledger] = await this.dataSource.query(
      `SELECT count(*)::int AS paid, count(DISTINCT provider_transfer_id)::int AS distinct_transfers FROM payout WHERE study_id = $1 AND status = 'paid'`,
      [this.studyId],
    );
    const reconciliation = await this.queue.reconciliation(this.studyId);
    return {
      transfers: transfers.length,
      payoutsWithATransfer: perPayout.size,
      duplicates,
      ledgerPaid: ledger.paid,
      ledgerDistinctTransfers: ledger.distinct_transfers,
      differences: reconciliation.differences.length,
    };
  }

  async receiptsSent(): Promise<number> {
    const [{ n }] = await this.dataSource.query(
      `SELECT count(*)::int AS n FROM payout WHERE study_id = $1 AND receipt_sent_at IS NOT NULL`,
      [this.studyId],
    );
    return n;
  }
}

async function main(): Promise<number> {
  const databaseUrl = process.env.DATABASE_URL;
  if (!databaseUrl) {
    console.error(DATABASE_URL_HELP.replaceAll('npm run bench', 'bash api/src/bench/run-payout-bench.sh'));
    return 1;
  }
  if (!process.env.STRIPE_PORT)
    throw new BenchSetupError(
      'STRIPE_PORT must name the port of a running payments stand-in (run-payout-bench.sh starts one)',
    );
  const payoutCount = wholeNumberSetting('BENCH_PAYOUTS', 10_000, 100, 100_000);
  const payees = wholeNumberSetting('BENCH_PAYEES', 500, 1, 10_000);
  const apiPort = wholeNumberSetting('BENCH_API_PORT', 3190, 1024, 65535);
  if (payoutCount % payees !== 0)
    throw new BenchSetupError(`BENCH_PAYOUTS (${payoutCount}) must be a multiple of BENCH_PAYEES (${payees})`);
  const interrupted = abortOnInterrupt(log);

  const started = Date.now();
  const database = await BenchOwnDatabase.create(databaseUrl);
  let app: INestApplication | null = null;
  try {
    log(`database ${database.name} created`);
    await database.migrate();
    Object.assign(process.env, { DATABASE_URL: database.url, RUN_WORKERS: 'true', JOB_RETRY_DELAY_SECONDS: '1' });
    app = await NestFactory.create(AppModule, { rawBody: true, logger: ['error', 'warn'] });
    configureApp(app);
    // Listening, so the provider's webhooks (transfer.created for every transfer, ours and the baseline's) land
    // here as they do in the running api.
    await app.listen(apiPort, '127.0.0.1');
    const bench = new PayoutBench(app, interrupted);
    await bench.createStudy(payoutCount / payees);
    await bench.onboardPayees(payees);
    const owed = await bench.owePayouts();
    if (owed !== payoutCount) throw new Error(`expected ${payoutCount} owed payouts, made ${owed}`);
    await bench.fundStudy(payoutCount * PAYOUT_MINOR);
    const warmUp = Math.min(500, payoutCount);
    await bench.fundBaseline((payoutCount + warmUp) * PAYOUT_MINOR);
    log(
      `set up: ${payees} payees onboarded, ${owed} owed payouts, study funded (${((Date.now() - started) / 1000).toFixed(0)} s)`,
    );

    await bench.baseline(warmUp);
    const raw = await bench.baseline(payoutCount);
    log(`baseline: ${payoutCount} bare transfers in ${raw.seconds.toFixed(1)} s (${raw.perSecond.toFixed(0)}/s)`);
    const paid = await bench.payEverything(payoutCount);
    log(`paid: ${payoutCount} payouts in ${paid.totalSeconds.toFixed(1)} s (${paid.perSecond.toFixed(0)}/s)`);
    const once = await bench.exactlyOnce();
    const receiptsWhenDone = await bench.receiptsSent();
    await until(
      async () => ((await bench.receiptsSent()) === payoutCount ? true : null),
      'every receipt to be sent',
      10 * 60_000,
      interrupted,
    );

    const problems: string[] = [];
    if (once.transfers !== payoutCount)
      problems.push(`the provider holds ${once.transfers} transfers for ${payoutCount} payouts`);
    if (once.duplicates !== 0) problems.push(`${once.duplicates} duplicate transfer(s)`);
    if (once.ledgerDistinctTransfers !== payoutCount)
      problems.push(`${once.ledgerDistinctTransfers} distinct transfer ids in the ledger`);
    if (once.differences !== 0) problems.push(`reconciliation lists ${once.differences} difference(s)`);

    console.log('');
    console.log(
      formatTable({
        title: `${payoutCount} payouts to ${payees} payees against bare transfer creation (${JOB_BATCH_SIZE} at a time, one run each)`,
        unit: 'per s',
        ratioHeading: '÷ baseline',
        rows: [
          reportRow('bare transfers.create at the provider', [raw.perSecond]),
          reportRow('approve → job → transfer → paid', [paid.perSecond], [raw.perSecond]),
        ],
      }),
    );
    const verdicts = [
      judge({
        label: 'payouts ÷ bare transfer creation',
        ratio: paid.perSecond / raw.perSecond,
        bound: 'at-least',
        value: PAYOUT_TARGET,
      }),
    ];
    console.log(`\n${formatVerdicts(verdicts)}\n`);
    console.log(
      JSON.stringify({
        benchmark: 'payouts',
        payouts: payoutCount,
        payees,
        concurrency: JOB_BATCH_SIZE,
        postgres: await database.serverVersion(),
        baselineTransfersPerSecond: Math.round(raw.perSecond),
        payoutsPerSecond: Math.round(paid.perSecond),
        ratio: Number((paid.perSecond / raw.perSecond).toFixed(3)),
        approveSeconds: Number(paid.approveSeconds.toFixed(1)),
        payoutSeconds: Number(paid.totalSeconds.toFixed(1)),
        sendAttempts: paid.attempts,
        receiptsSentWhenLastPaid: receiptsWhenDone,
        ...once,
        target: { atLeast: PAYOUT_TARGET, met: verdicts[0].met },
        seconds: Math.round((Date.now() - started) / 100) / 10,
      }),
    );
    if (problems.length) {
      console.error(`[payout-bench] NOT exactly once: ${problems.join('; ')}`);
      return 1;
    }
    return exitCodeFor(verdicts);
  } finally {
    if (app) await app.close();
    await database.dropAndDisconnect();
    log('database dropped');
  }
}

runBenchmark('payout-bench', main);
