/**
 * `node dist/bench/run-signing-bench.js` (DATABASE_URL required): consent signings per second at 32 concurrent
 * clients, each a full `EnrollmentsService.sign` (lock, version check, allocation, signature, audit, signed-copy
 * job), against bare one-row INSERT transactions measured in the same run. Works in a throwaway database on that
 * server (see bench-own-database.ts) and removes it. See README.md beside this file.
 */
import 'reflect-metadata';
import type { INestApplicationContext } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import { DataSource } from 'typeorm';
import type { PostgresDriver } from 'typeorm/driver/postgres/PostgresDriver';
import { AppModule } from '../app.module';
import type { SessionUser } from '../common/auth/session-user';
import { EnrollmentsService } from '../enrollments/enrollments.service';
import { JOB_NAMES } from '../jobs/job-queue.service';
import { RandomizationService } from '../randomization/randomization.service';
import { activateBenchConsent } from './bench-consent';
import { StepsService } from '../steps/steps.service';
import { StudiesService } from '../studies/studies.service';
import { DATABASE_URL_HELP, wholeNumberSetting } from './bench-database';
import { BenchOwnDatabase } from './bench-own-database';
import { formatTable, median, reportRow } from './bench-report';
import { BENCH_SCHEMES, PRETEST_CUT } from './bench-study';
import { abortOnInterrupt, runConcurrently, runBenchmark } from './concurrent-runner';

const CONNECTIONS = 32;
const CLIENT = { ip: '127.0.0.1', userAgent: 'Evenhand signing benchmark' };
interface SigningStudy {
  studyId: string;
  version: { versionId: string; fingerprint: string };
  participants: SessionUser[];
}

class SigningBench {
  private readonly dataSource: DataSource;
  private readonly studies: StudiesService;
  private readonly steps: StepsService;
  private readonly randomization: RandomizationService;
  private readonly enrollments: EnrollmentsService;
  private researcher: SessionUser | null = null;
  private created = 0;

  constructor(
    private readonly app: INestApplicationContext,
    private readonly signal: AbortSignal,
  ) {
    this.dataSource = app.get(DataSource);
    this.studies = app.get(StudiesService);
    this.steps = app.get(StepsService);
    this.randomization = app.get(RandomizationService);
    this.enrollments = app.get(EnrollmentsService);
  }

  async createScratchTable(): Promise<void> {
    await this.dataSource.query(`CREATE TABLE bench_scratch (id bigserial PRIMARY KEY, note text NOT NULL, at timestamptz NOT NULL DEFAULT now())`);
  }

  /** The same baseline as run-bench.ts: BEGIN, one INSERT, COMMIT, through the same pool and helper. */
  baseline(n: number) {
    return runConcurrently(
      n,
      CONNECTIONS,
      (i) => this.dataSource.transaction((manager) => manager.query(`INSERT INTO bench_scratch (note) VALUES ($1)`, [`arrival ${i}`])),
      this.signal,
    );
  }

  /** A fresh recruiting study per round (set up outside the timing), then n people signing at once. */
  async signings(n: number) {
    const study = await this.recruitingStudy(n);
    const sample = await runConcurrently(
      n,
      CONNECTIONS,
      async (i) => {
        const { created } = await this.enrollments.sign(study.participants[i], study.studyId, { ...study.version, typedName: `Bench Participant ${i + 1}` }, CLIENT);
        if (!created) throw new Error(`participant ${i + 1} had already signed`);
      },
      this.signal,
    );
    await this.checkEverySigningLanded(study);
    return sample;
  }

  /** Each signing must leave one signature, one assignment, one allocation and one queued signed copy. */
  private async checkEverySigningLanded(study: SigningStudy): Promise<void> {
    const n = study.participants.length;
    const [row] = await this.dataSource.query(
      `SELECT (SELECT count(*)::int FROM enrollment WHERE study_id = $1 AND status = 'assigned' AND signed_version_id = $2) AS assigned,
              (SELECT count(DISTINCT s.enrollment_id)::int FROM signature s JOIN enrollment e ON e.id = s.enrollment_id WHERE e.study_id = $1) AS signed,
              (SELECT count(DISTINCT sequence)::int FROM allocation WHERE study_id = $1) AS sequences,
              (SELECT count(*)::int FROM job_queue.job j JOIN signature s ON s.id::text = j.data->>'signatureId'
                 JOIN enrollment e ON e.id = s.enrollment_id WHERE j.name = $3 AND e.study_id = $1) AS queued`,
      [study.studyId, study.version.versionId, JOB_NAMES.signedCopy],
    );
    if (row.assigned !== n || row.signed !== n || row.sequences !== n || row.queued !== n) {
      throw new Error(`expected ${n} assigned, signed, allocated and queued, found ${JSON.stringify(row)}`);
    }
  }

  /** As the admin screens do it: conditions, a pretest factor, one step, stratified blocks, open, consent active. */
  private async recruitingStudy(n: number): Promise<SigningStudy> {
    const researcher = await this.benchResearcher();
    this.created += 1;
    const study = await this.studies.create(researcher, {
      slug: `bench-signing-${this.created}`,
      title: `Signing benchmark study ${this.created}`,
      design: 'between',
      protocolNumber: `BENCH-${this.created}`,
      labName: 'Quillmoor Benchmark Lab (invented)',
      estimatedMinutes: 30,
      targetSize: n,
    });
    for (const name of ['cue-a', 'cue-b']) {
      await this.studies.createCondition(researcher, study.id, { internalName: name, participantLabel: `Route guide ${name.slice(-1).toUpperCase()}` });
    }
    await this.studies.replaceFactors(researcher, study.id, [{ key: 'pretest', label: 'Pretest score (0–100)', kind: 'numeric', cutPoints: [PRETEST_CUT] }]);
    await this.steps.create(researcher, study.id, { title: 'Session 1', payMinor: 1000 });
    await this.dataSource.transaction(async (manager) => {
      const snapshot = await this.studies.designSnapshot(study.id, manager);
      await this.randomization.saveScheme(manager, researcher, study.id, 'stratified-blocks', BENCH_SCHEMES['stratified-blocks'], snapshot, false);
    });
    const active = await activateBenchConsent(this.app, researcher, study.id, `QREB-BENCH-${this.created}`);
    await this.studies.transition(researcher, study.id, 'open');
    return { studyId: study.id, version: { versionId: active.id, fingerprint: active.fingerprint }, participants: await this.screenedParticipants(study.id, n) };
  }

  /** Participants who passed screening, written directly as the roster import does. */
  private async screenedParticipants(studyId: string, count: number): Promise<SessionUser[]> {
    const rows: Array<{ id: string; email: string }> = await this.dataSource.query(
      `WITH arrival AS (
         SELECT g AS n, format('bench-sign-%s-%s@example.test', $1::text, g) AS email FROM generate_series(1, $2::int) g
       ), participant AS (
         INSERT INTO user_account (email, role) SELECT email, 'participant' FROM arrival RETURNING id, email
       ), enrolled AS (
         INSERT INTO enrollment (study_id, participant_id, reference, status, covariates, screened_at)
         SELECT $1::uuid, participant.id, format('S-%s', lpad(arrival.n::text, 6, '0')), 'screened', jsonb_build_object('pretest', arrival.n % 100), now()
         FROM arrival JOIN participant USING (email)
       )
       SELECT participant.id, participant.email FROM participant JOIN arrival USING (email) ORDER BY arrival.n`,
      [studyId, count],
    );
    return rows.map((row) => ({ id: row.id, email: row.email, name: '', role: 'participant' }) as SessionUser);
  }

  private async benchResearcher(): Promise<SessionUser> {
    if (this.researcher) return this.researcher;
    const [row] = await this.dataSource.query(
      `INSERT INTO user_account (email, name, role) VALUES ('bench-researcher@evenhand.test', 'Bench Researcher', 'researcher') RETURNING id, email, name, role`,
    );
    this.researcher = row as SessionUser;
    return this.researcher;
  }
}

async function main(): Promise<number> {
  const databaseUrl = process.env.DATABASE_URL;
  if (!databaseUrl) {
    console.error(DATABASE_URL_HELP.replaceAll('npm run bench', 'node api/dist/bench/run-signing-bench.js'));
    return 1;
  }
  const signings = wholeNumberSetting('BENCH_SIGNINGS', 600, 50, 20_000);
  const rounds = wholeNumberSetting('BENCH_ROUNDS', 3, 1, 20);
  const log = (line: string) => console.log(`[signing-bench] ${line}`);
  const interrupted = abortOnInterrupt(log);

  const started = Date.now();
  const database = await BenchOwnDatabase.create(databaseUrl);
  let app: INestApplicationContext | null = null;
  try {
    log(`database ${database.name} created`);
    await database.migrate();
    process.env.DATABASE_URL = database.url;
    process.env.RUN_WORKERS = 'false';
    app = await NestFactory.createApplicationContext(AppModule, { logger: ['error', 'warn'] });
    const dataSource = app.get(DataSource);
    await dataSource.destroy();
    dataSource.setOptions({ extra: { ...(dataSource.options.extra ?? {}), max: CONNECTIONS } });
    await dataSource.initialize();

    const bench = new SigningBench(app, interrupted);
    await bench.createScratchTable();
    const warmUp = Math.min(100, signings);
    await bench.baseline(warmUp);
    await bench.signings(warmUp);
    log(`warm-up done (${warmUp} of each)`);
    const baseline: number[] = [];
    const signed: number[] = [];
    for (let round = 1; round <= rounds; round++) {
      const base = await bench.baseline(signings);
      baseline.push(base.perSecond);
      const sign = await bench.signings(signings);
      signed.push(sign.perSecond);
      log(`round ${round}/${rounds}: baseline ${base.perSecond.toFixed(0)}/s, signing ${sign.perSecond.toFixed(0)}/s`);
    }
    const pool = (dataSource.driver as PostgresDriver).master as { totalCount: number; options: { max: number } };
    if (pool.options.max !== CONNECTIONS || pool.totalCount !== CONNECTIONS) {
      throw new Error(`the pool should hold ${CONNECTIONS} connections, but its limit is ${pool.options.max} and it opened ${pool.totalCount}`);
    }
    const rows = [reportRow('bare one-row INSERT transaction', baseline), reportRow('sign consent (stratified blocks, 2 strata)', signed, baseline)];
    console.log('');
    console.log(
      formatTable({
        title: `Signings at ${CONNECTIONS} concurrent clients (pool of ${pool.options.max}; ${signings} per round, ${rounds} round${rounds === 1 ? '' : 's'}, each one transaction)`,
        unit: 'per s',
        ratioHeading: '÷ baseline',
        rows,
      }),
    );
    console.log('');
    const rates = (list: number[]) => list.map((v) => Math.round(v));
    console.log(
      JSON.stringify({
        benchmark: 'signing',
        connections: CONNECTIONS,
        signingsPerRound: signings,
        rounds,
        postgres: await database.serverVersion(),
        baselinePerSecond: { median: Math.round(median(baseline)), rounds: rates(baseline) },
        signingsPerSecond: { median: Math.round(median(signed)), ratio: Number(rows[1].ratio!.toFixed(4)), rounds: rates(signed) },
        seconds: Math.round((Date.now() - started) / 100) / 10,
      }),
    );
    return 0;
  } finally {
    try {
      await app?.close();
    } finally {
      await database.dropAndDisconnect();
      log(`database ${database.name} dropped`);
    }
  }
}

runBenchmark('signing-bench', main);
