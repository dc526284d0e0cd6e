/**
 * `node dist/bench/run-signing-bench.js` (DATABASE_URL required): consent signings per second at 32 concurrent
 * HTTP clients, each a full `POST /api/studies/:id/enrollments/me/signature` with a participant's session (session
 * check, version check, allocation, signature, audit event, signed-copy job), against the bare-INSERT route served
 * by the same Nest app (`POST /api/bench/bare-insert`, BEGIN + one INSERT + COMMIT), measured in the same run.
 * Works in a throwaway database on that server (see bench-own-database.ts) and removes it. See README.md.
 */
import 'reflect-metadata';
import type { INestApplication } from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';
import { ChildProcess, spawn } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { Agent, request } from 'node:http';
import { join } from 'node:path';
import { createInterface } from 'node:readline';
import { DataSource } from 'typeorm';
import type { PostgresDriver } from 'typeorm/driver/postgres/PostgresDriver';
import { newOpaqueToken } from '../auth/session-tokens';
import { ACCESS_COOKIE, SessionUser } from '../common/auth/session-user';
import { JOB_NAMES } from '../jobs/job-queue.service';
import { RandomizationService } from '../randomization/randomization.service';
import { activateBenchConsent } from './bench-consent';
import { bootBenchHttpApp } from './bench-app';
import { StepsService } from '../steps/steps.service';
import { StudiesService } from '../studies/studies.service';
import { DATABASE_URL_HELP, wholeNumberSetting } from './bench-database';
import { BenchOwnDatabase } from './bench-own-database';
import { formatTable, median, reportRow } from './bench-report';
import { exitCodeFor, formatVerdicts, judge } from './bench-targets';
import { addBenchDesign, BENCH_SCHEMES } from './bench-study';
import { abortOnInterrupt, runConcurrently, runBenchmark } from './concurrent-runner';

const CONNECTIONS = 32;
/** Issue 17: signing at 32 concurrent clients reaches at least half the bare INSERT's rate, both over HTTP. */
const SIGNING_TARGET = 0.5;
/** Issue 17: with a second api process on the same database (clients spread across both) the signing rate rises. */
const SECOND_PROCESS_TARGET = 1;
interface SigningStudy {
  studyId: string;
  version: { versionId: string; fingerprint: string };
  participants: Array<SessionUser & { accessToken: string }>;
}

class SigningBench {
  private readonly dataSource: DataSource;
  private readonly studies: StudiesService;
  private readonly steps: StepsService;
  private readonly randomization: RandomizationService;
  private readonly jwt: JwtService;
  /** Keep-alive connections, one per client, as 32 browsers would hold. */
  private readonly http = new Agent({ keepAlive: true, maxSockets: CONNECTIONS });
  private researcher: SessionUser | null = null;
  private created = 0;

  constructor(
    private readonly app: INestApplication,
    private readonly baseUrls: string[],
    private readonly signal: AbortSignal,
  ) {
    this.dataSource = app.get(DataSource);
    this.studies = app.get(StudiesService);
    this.steps = app.get(StepsService);
    this.randomization = app.get(RandomizationService);
    this.jwt = app.get(JwtService);
  }

  close(): void {
    this.http.destroy();
  }

  /** POSTs JSON and returns the status; any other status than the expected one fails the run with the body. */
  private async post(url: string, body: unknown, expected: number, cookie?: string): Promise<void> {
    const payload = JSON.stringify(body);
    const { status, text } = await new Promise<{ status: number; text: string }>((resolve, reject) => {
      const call = request(
        url,
        {
          method: 'POST',
          agent: this.http,
          headers: {
            'content-type': 'application/json',
            'content-length': Buffer.byteLength(payload),
            ...(cookie ? { cookie } : {}),
          },
        },
        (response) => {
          const chunks: Buffer[] = [];
          response.on('data', (chunk: Buffer) => chunks.push(chunk));
          response.on('end', () =>
            resolve({ status: response.statusCode ?? 0, text: Buffer.concat(chunks).toString('utf8') }),
          );
          response.on('error', reject);
        },
      );
      call.on('error', reject);
      call.end(payload);
    });
    if (status !== expected)
      throw new Error(`POST ${url} answered ${status}, expected ${expected}: ${text.slice(0, 300)}`);
  }

  /** The bare-INSERT route, by the same number of clients over the same HTTP stack. */
  baseline(n: number) {
    return runConcurrently(
      n,
      CONNECTIONS,
      (i) => this.post(`${this.baseUrls[i % this.baseUrls.length]}/bench/bare-insert`, {}, 200),
      this.signal,
    );
  }

  /**
   * A fresh recruiting study per round (set up outside the timing), then n people signing at once over HTTP, spread
   * round-robin over `urls` (one api process, or several on the same database).
   */
  async signings(n: number, urls: readonly string[] = this.baseUrls) {
    const study = await this.recruitingStudy(n);
    const sample = await runConcurrently(
      n,
      CONNECTIONS,
      (i) => {
        const participant = study.participants[i];
        return this.post(
          `${urls[i % urls.length]}/studies/${study.studyId}/enrollments/me/signature`,
          { ...study.version, typedName: `Bench Participant ${i + 1}` },
          201,
          `${ACCESS_COOKIE}=${participant.accessToken}`,
        );
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
    // Every signing audits its signature and its allocation, and the study's chain still verifies.
    const [audit] = await this.dataSource.query(
      `SELECT count(*) FILTER (WHERE action = 'consent.signed')::int AS signed, count(*) FILTER (WHERE action = 'assignment.allocated')::int AS allocated
       FROM audit_event WHERE chain = $1`,
      [study.studyId],
    );
    if (audit.signed !== n || audit.allocated !== n)
      throw new Error(`expected ${n} signing and ${n} allocation audit events, found ${JSON.stringify(audit)}`);
    // No collisions: each taken slot has its own taker, and each stratum's taken positions run 1…k without a gap.
    const [slots] = await this.dataSource.query(
      `SELECT count(*)::int AS taken, count(DISTINCT taken_by)::int AS takers,
              count(*) FILTER (WHERE position > per_stratum)::int AS beyond
       FROM (SELECT taken_by, position, count(*) OVER (PARTITION BY stratum_key) AS per_stratum
             FROM allocation_slot WHERE study_id = $1 AND taken_by IS NOT NULL) taken`,
      [study.studyId],
    );
    if (slots.taken !== n || slots.takers !== n || slots.beyond !== 0)
      throw new Error(`expected ${n} slots taken once each without gaps, found ${JSON.stringify(slots)}`);
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
    await addBenchDesign(this.studies, researcher, study.id);
    await this.steps.create(researcher, study.id, { title: 'Session 1', payMinor: 1000 });
    await this.dataSource.transaction(async (manager) => {
      const snapshot = await this.studies.designSnapshot(study.id, manager);
      await this.randomization.saveScheme(
        manager,
        researcher,
        study.id,
        'stratified-blocks',
        BENCH_SCHEMES['stratified-blocks'],
        snapshot,
        false,
      );
    });
    const active = await activateBenchConsent(this.app, researcher, study.id, `QREB-BENCH-${this.created}`);
    await this.studies.transition(researcher, study.id, 'open');
    return {
      studyId: study.id,
      version: { versionId: active.id, fingerprint: active.fingerprint },
      participants: await this.screenedParticipants(study.id, n),
    };
  }

  /** Participants who passed screening, written directly as the roster import does, each with a live session. */
  private async screenedParticipants(studyId: string, count: number): Promise<SigningStudy['participants']> {
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
    const sessions = rows.map((row) => ({ userId: row.id, familyId: randomUUID(), hash: newOpaqueToken().hash }));
    await this.dataSource.query(
      `INSERT INTO refresh_token (user_id, family_id, token_hash, expires_at)
       SELECT * , now() + interval '1 hour' FROM unnest($1::uuid[], $2::uuid[], $3::text[])`,
      [sessions.map((s) => s.userId), sessions.map((s) => s.familyId), sessions.map((s) => s.hash)],
    );
    return Promise.all(
      rows.map(async (row, i) => ({
        id: row.id,
        email: row.email,
        name: '',
        role: 'participant' as const,
        accessToken: await this.jwt.signAsync(
          { sub: row.id, role: 'participant', sid: sessions[i].familyId },
          { expiresIn: 3600 },
        ),
      })),
    ) as Promise<SigningStudy['participants']>;
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

/**
 * A second api process (serve-bench-app.js) on the same database, as a second replica would run: its own pool,
 * chainer and HTTP server. Resolves once it listens; `stop` ends it (SIGTERM, then SIGKILL after 10 s).
 */
async function startSecondProcess(databaseUrl: string): Promise<{ baseUrl: string; stop: () => Promise<void> }> {
  const child: ChildProcess = spawn(process.execPath, [join(__dirname, 'serve-bench-app.js')], {
    env: { ...process.env, DATABASE_URL: databaseUrl, BENCH_POOL: String(CONNECTIONS) },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  const stop = async () => {
    if (child.exitCode !== null || child.signalCode !== null) return;
    child.kill('SIGTERM');
    const timer = setTimeout(() => child.kill('SIGKILL'), 10_000);
    await exited;
    clearTimeout(timer);
  };
  try {
    const baseUrl = await new Promise<string>((resolve, reject) => {
      child.once('exit', (code) => reject(new Error(`the second api process exited (${code}) before listening`)));
      createInterface({ input: child.stdout! }).on('line', (line) => {
        try {
          const { baseUrl: url } = JSON.parse(line) as { baseUrl?: string };
          if (url) resolve(url);
        } catch {
          // Not the ready line; the process may log other things.
        }
      });
    });
    return { baseUrl, stop };
  } catch (error) {
    await stop();
    throw error;
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
  const port = wholeNumberSetting('BENCH_SIGNING_API_PORT', 0, 0, 65535);
  const log = (line: string) => console.log(`[signing-bench] ${line}`);
  const interrupted = abortOnInterrupt(log);

  const started = Date.now();
  const database = await BenchOwnDatabase.create(databaseUrl);
  let app: INestApplication | null = null;
  let bench: SigningBench | null = null;
  let second: { baseUrl: string; stop: () => Promise<void> } | null = null;
  try {
    log(`database ${database.name} created`);
    await database.migrate();
    const served = await bootBenchHttpApp(database.url, CONNECTIONS, port);
    app = served.app;
    log(`api serving on ${served.baseUrl}`);
    const dataSource = app.get(DataSource);

    second = await startSecondProcess(database.url);
    log(`second api process serving on ${second.baseUrl}`);
    const bothProcesses = [served.baseUrl, second.baseUrl];

    bench = new SigningBench(app, [served.baseUrl], interrupted);
    const warmUp = Math.min(100, signings);
    await bench.baseline(warmUp);
    await bench.signings(warmUp);
    await bench.signings(warmUp, bothProcesses);
    log(`warm-up done (${warmUp} of each)`);
    const baseline: number[] = [];
    const signed: number[] = [];
    const signedOnTwo: number[] = [];
    for (let round = 1; round <= rounds; round++) {
      const base = await bench.baseline(signings);
      baseline.push(base.perSecond);
      const sign = await bench.signings(signings);
      signed.push(sign.perSecond);
      const onTwo = await bench.signings(signings, bothProcesses);
      signedOnTwo.push(onTwo.perSecond);
      log(
        `round ${round}/${rounds}: bare INSERT ${base.perSecond.toFixed(0)}/s, signing ${sign.perSecond.toFixed(0)}/s, ` +
          `signing on two processes ${onTwo.perSecond.toFixed(0)}/s`,
      );
    }
    const pool = (dataSource.driver as PostgresDriver).master as { totalCount: number; options: { max: number } };
    if (pool.options.max !== CONNECTIONS)
      throw new Error(`the pool should hold ${CONNECTIONS} connections, but its limit is ${pool.options.max}`);
    const rows = [
      reportRow('POST /bench/bare-insert (BEGIN, INSERT, COMMIT)', baseline),
      reportRow('POST …/enrollments/me/signature (stratified blocks, 2 strata)', signed, baseline),
      reportRow('the same signing, clients spread over two api processes', signedOnTwo, baseline),
    ];
    console.log('');
    console.log(
      formatTable({
        title: `Signings over HTTP at ${CONNECTIONS} concurrent clients (pool of ${pool.options.max}, ${pool.totalCount} opened; ${signings} per round, ${rounds} round${rounds === 1 ? '' : 's'})`,
        unit: 'per s',
        ratioHeading: '÷ baseline',
        rows,
      }),
    );
    const verdicts = [
      judge({
        label: 'signing ÷ bare INSERT, both over HTTP',
        ratio: rows[1].ratio!,
        bound: 'at-least',
        value: SIGNING_TARGET,
      }),
      judge({
        label: 'signing on two api processes ÷ on one (0 collisions checked each round)',
        ratio: median(signedOnTwo) / median(signed),
        bound: 'at-least',
        value: SECOND_PROCESS_TARGET,
      }),
    ];
    console.log(`\n${formatVerdicts(verdicts)}\n`);
    const rates = (list: number[]) => list.map((v) => Math.round(v));
    console.log(
      JSON.stringify({
        benchmark: 'signing',
        over: 'http',
        connections: CONNECTIONS,
        signingsPerRound: signings,
        rounds,
        postgres: await database.serverVersion(),
        baselinePerSecond: { median: Math.round(median(baseline)), rounds: rates(baseline) },
        signingsPerSecond: {
          median: Math.round(median(signed)),
          ratio: Number(rows[1].ratio!.toFixed(4)),
          rounds: rates(signed),
        },
        target: { atLeast: SIGNING_TARGET, met: verdicts[0].met },
        twoProcesses: {
          signingsPerSecond: { median: Math.round(median(signedOnTwo)), rounds: rates(signedOnTwo) },
          overOneProcess: Number(verdicts[1].ratio.toFixed(4)),
          target: { atLeast: SECOND_PROCESS_TARGET, met: verdicts[1].met },
        },
        seconds: Math.round((Date.now() - started) / 100) / 10,
      }),
    );
    return exitCodeFor(verdicts);
  } finally {
    try {
      bench?.close();
      await second?.stop();
      await app?.close();
    } finally {
      await database.dropAndDisconnect();
      log(`database ${database.name} dropped`);
    }
  }
}

runBenchmark('signing-bench', main);
