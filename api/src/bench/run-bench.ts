/**
 * `npm run bench -w api`: allocations per second at 32 concurrent connections, against bare one-row INSERT
 * transactions measured in the same run, for stratified blocks (a lock per stratum) and minimization (one lock
 * for the whole study); then the dry run of 10,000 arrivals against drawing 10,000 numbers from a seeded stream.
 * Needs DATABASE_URL; works in a throwaway schema there and removes it. See README.md beside this file.
 */
import 'reflect-metadata';
import type { INestApplicationContext } from '@nestjs/common';
import { DataSource } from 'typeorm';
import type { PostgresDriver } from 'typeorm/driver/postgres/PostgresDriver';
import { bootBenchContext } from './bench-app';
import { formatVerdicts, judge } from './bench-targets';
import type { AuditActor } from '../audit/audit.service';
import { RandomizationService } from '../randomization/randomization.service';
import { createSeededStream, generateSeed, streamLabel } from '../randomization/seeded-stream';
import { BenchDatabase, DATABASE_URL_HELP, wholeNumberSetting } from './bench-database';
import { formatTable, median, reportRow, ReportTable } from './bench-report';
import { BENCH_SCHEMES, BenchStudies, BenchStudy, PRETEST_CUT } from './bench-study';
import { abortOnInterrupt, runConcurrently, timeSync, runBenchmark } from './concurrent-runner';

const CONNECTIONS = 32;
const DRY_RUN_ARRIVALS = 10_000;
const DRY_RUN_ROUNDS = 7;
const DRY_RUN_WARM_UPS = 3;
const ACTOR: AuditActor = { id: null, email: 'benchmark@evenhand.test' };
type BenchScheme = keyof typeof BENCH_SCHEMES;
const SCHEMES = Object.keys(BENCH_SCHEMES) as BenchScheme[];

function poolOf(dataSource: DataSource): { totalCount: number; options: { max: number } } {
  return (dataSource.driver as PostgresDriver).master;
}

class AllocationBench {
  private readonly dataSource: DataSource;
  private readonly randomization: RandomizationService;
  private readonly studies: BenchStudies;

  constructor(
    app: INestApplicationContext,
    private readonly signal: AbortSignal,
  ) {
    this.dataSource = app.get(DataSource);
    this.randomization = app.get(RandomizationService);
    this.studies = new BenchStudies(app);
  }

  get studyDesigns(): BenchStudies {
    return this.studies;
  }

  async createScratchTable(): Promise<void> {
    await this.dataSource.query(
      `CREATE TABLE bench_scratch (id bigserial PRIMARY KEY, note text NOT NULL, at timestamptz NOT NULL DEFAULT now())`,
    );
  }

  /** n transactions, each BEGIN, one INSERT, COMMIT, through the same pool and the same transaction helper. */
  baseline(n: number) {
    return runConcurrently(
      n,
      CONNECTIONS,
      (i) =>
        this.dataSource.transaction((manager) =>
          manager.query(`INSERT INTO bench_scratch (note) VALUES ($1)`, [`arrival ${i}`]),
        ),
      this.signal,
    );
  }

  /** A fresh study per round (set up outside the timing), then n allocations, each in its own transaction. */
  async allocations(method: BenchScheme, n: number) {
    const study = await this.studies.open(method, n);
    const sample = await runConcurrently(
      n,
      CONNECTIONS,
      (i) => {
        const { enrollmentId, covariates } = study.enrollments[i];
        return this.dataSource.transaction((manager) =>
          this.randomization.allocate(manager, ACTOR, { studyId: study.studyId, enrollmentId, covariates }),
        );
      },
      this.signal,
    );
    await this.checkNothingLostOrShared(study, method);
    return { ...sample, studyId: study.studyId };
  }

  /** A fast benchmark that hands out duplicate or skipped slots would be worthless: check before reporting. */
  private async checkNothingLostOrShared(study: BenchStudy, method: BenchScheme): Promise<void> {
    const n = study.enrollments.length;
    const [row] = await this.dataSource.query(
      `SELECT count(*)::int AS allocated, count(DISTINCT enrollment_id)::int AS people, count(DISTINCT sequence)::int AS sequences
       FROM allocation WHERE study_id = $1`,
      [study.studyId],
    );
    if (row.allocated !== n || row.people !== n || row.sequences !== n) {
      throw new Error(`${method}: expected ${n} distinct allocations, found ${JSON.stringify(row)}`);
    }
    // The real path audits every allocation; a benchmark that skipped it would flatter the rate.
    const [{ audited }] = await this.dataSource.query(
      `SELECT count(*)::int AS audited FROM audit_event WHERE chain = $1 AND action = 'assignment.allocated'`,
      [study.studyId],
    );
    if (audited !== n) throw new Error(`${method}: expected ${n} audit events for the allocations, found ${audited}`);
    if (method === 'stratified-blocks') {
      const strata: Array<{ stratum_key: string; taken: number; highest: number }> = await this.dataSource.query(
        `SELECT stratum_key, count(*)::int AS taken, max(position)::int AS highest
         FROM allocation_slot WHERE study_id = $1 AND taken_by IS NOT NULL GROUP BY 1`,
        [study.studyId],
      );
      const skipped = strata.filter((s) => s.taken !== s.highest);
      if (strata.length !== 2 || skipped.length > 0 || strata.reduce((sum, s) => sum + s.taken, 0) !== n) {
        throw new Error(`stratified-blocks: slots taken are not 1..k in each of 2 strata: ${JSON.stringify(strata)}`);
      }
    }
  }
}

interface Measured {
  baseline: number[];
  schemes: Record<BenchScheme, number[]>;
}

async function measureDatabase(
  bench: AllocationBench,
  arrivals: number,
  rounds: number,
  log: (line: string) => void,
): Promise<Measured> {
  const warmUp = Math.min(200, arrivals);
  await bench.baseline(warmUp);
  for (const method of SCHEMES) await bench.allocations(method, warmUp);
  log(`warm-up done (${warmUp} of each)`);

  const measured: Measured = { baseline: [], schemes: { 'stratified-blocks': [], minimization: [] } };
  for (let round = 1; round <= rounds; round++) {
    const parts: string[] = [];
    for (const method of SCHEMES) {
      const base = await bench.baseline(arrivals);
      measured.baseline.push(base.perSecond);
      const allocated = await bench.allocations(method, arrivals);
      measured.schemes[method].push(allocated.perSecond);
      parts.push(`baseline ${base.perSecond.toFixed(0)}/s, ${method} ${allocated.perSecond.toFixed(0)}/s`);
    }
    log(`round ${round}/${rounds}: ${parts.join('; ')}`);
  }
  return measured;
}

async function measureDryRun(
  studies: BenchStudies,
  randomization: RandomizationService,
): Promise<{ baseline: number[]; schemes: Record<BenchScheme, number[]> }> {
  // Any study of the bench design will do: the dry run reads only its conditions and factors.
  const { studyId } = await studies.open('stratified-blocks', 1);
  const snapshot = await studies.designSnapshot(studyId);
  const seed = generateSeed();
  const covariateMix = { pretest: { kind: 'normal' as const, mean: PRETEST_CUT - 5, sd: 15 } };
  const drawNumbers = () => {
    const stream = createSeededStream(seed, streamLabel.dryRunCovariates());
    let sum = 0;
    for (let i = 0; i < DRY_RUN_ARRIVALS; i++) sum += stream.uniform();
    return sum;
  };
  const dryRun = (method: BenchScheme) => () => {
    const result = randomization.dryRun(method, BENCH_SCHEMES[method], snapshot, {
      arrivals: DRY_RUN_ARRIVALS,
      seed,
      covariateMix,
    });
    if (result.arrivals !== DRY_RUN_ARRIVALS || result.strata.length !== 2)
      throw new Error(`${method} dry run did not simulate ${DRY_RUN_ARRIVALS} arrivals in 2 strata`);
    return result;
  };
  // Let the JIT settle first: the earliest runs are several times slower than the rest.
  for (let i = 0; i < DRY_RUN_WARM_UPS; i++) {
    drawNumbers();
    for (const method of SCHEMES) dryRun(method)();
  }
  const seconds = {
    baseline: [] as number[],
    schemes: { 'stratified-blocks': [] as number[], minimization: [] as number[] },
  };
  for (let round = 0; round < DRY_RUN_ROUNDS; round++) {
    for (const method of SCHEMES) {
      seconds.baseline.push(timeSync(drawNumbers));
      seconds.schemes[method].push(timeSync(dryRun(method)));
    }
  }
  return seconds;
}

async function main(): Promise<number> {
  const databaseUrl = process.env.DATABASE_URL;
  if (!databaseUrl) {
    console.error(DATABASE_URL_HELP);
    return 1;
  }
  const arrivals = wholeNumberSetting('BENCH_ARRIVALS', 1000, 100, 100_000);
  const rounds = wholeNumberSetting('BENCH_ROUNDS', 3, 1, 20);
  const log = (line: string) => console.log(`[bench] ${line}`);

  const interrupted = abortOnInterrupt(log);

  const started = Date.now();
  const database = await BenchDatabase.connect(databaseUrl);
  let app: INestApplicationContext | null = null;
  try {
    await database.createAndMigrate();
    log(`schema ${database.schema} created and migrated`);
    app = await bootBenchContext(database.url, CONNECTIONS);
    const dataSource = app.get(DataSource);

    const bench = new AllocationBench(app, interrupted);
    await bench.createScratchTable();
    const measured = await measureDatabase(bench, arrivals, rounds, log);
    const pool = poolOf(dataSource);
    if (pool.options.max !== CONNECTIONS || pool.totalCount !== CONNECTIONS) {
      throw new Error(
        `the pool should hold ${CONNECTIONS} connections, but its limit is ${pool.options.max} and it opened ${pool.totalCount}`,
      );
    }
    const dryRun = await measureDryRun(bench.studyDesigns, app.get(RandomizationService));

    const throughput: ReportTable = {
      title: `Allocations at ${CONNECTIONS} concurrent connections (pool of ${pool.options.max}; ${arrivals} per round, ${rounds} round${rounds === 1 ? '' : 's'}, each in its own transaction)`,
      unit: 'per s',
      ratioHeading: '÷ baseline',
      rows: [
        reportRow('bare one-row INSERT transaction', measured.baseline),
        reportRow('allocate: stratified blocks (2 strata)', measured.schemes['stratified-blocks'], measured.baseline),
        reportRow('allocate: minimization (study lock)', measured.schemes.minimization, measured.baseline),
      ],
    };
    const ms = (list: number[]) => list.map((s) => s * 1000);
    const dryRunTable: ReportTable = {
      title: `Dry run of ${DRY_RUN_ARRIVALS.toLocaleString('en')} arrivals, in process (${DRY_RUN_ROUNDS} rounds)`,
      unit: 'ms',
      ratioHeading: '× baseline time',
      rows: [
        reportRow(`draw ${DRY_RUN_ARRIVALS.toLocaleString('en')} numbers, same seeded stream`, ms(dryRun.baseline)),
        reportRow('dry run: stratified blocks', ms(dryRun.schemes['stratified-blocks']), ms(dryRun.baseline)),
        reportRow('dry run: minimization', ms(dryRun.schemes.minimization), ms(dryRun.baseline)),
      ],
    };
    console.log(`\n${formatTable(throughput)}\n\n${formatTable(dryRunTable)}\n`);
    // Allocation alone has no target in this run (signing, which includes it, has one); printed for information.
    const verdicts = [
      judge({
        label: 'allocate (stratified blocks) ÷ bare INSERT',
        ratio: throughput.rows[1].ratio!,
        bound: null,
        value: null,
      }),
      judge({
        label: 'allocate (minimization) ÷ bare INSERT',
        ratio: throughput.rows[2].ratio!,
        bound: null,
        value: null,
      }),
    ];
    console.log(`${formatVerdicts(verdicts)}\n`);

    const rates = (samples: number[]) => samples.map((s) => Math.round(s * 10) / 10);
    const summary = {
      benchmark: 'evenhand-allocation',
      node: process.version,
      postgres: await database.serverVersion(),
      connections: CONNECTIONS,
      poolMax: pool.options.max,
      connectionsOpened: pool.totalCount,
      arrivalsPerRound: arrivals,
      rounds,
      baselinePerSecond: { median: Math.round(median(measured.baseline)), rounds: rates(measured.baseline) },
      stratifiedBlocksPerSecond: {
        median: Math.round(median(measured.schemes['stratified-blocks'])),
        ratio: Number(throughput.rows[1].ratio!.toFixed(4)),
        rounds: rates(measured.schemes['stratified-blocks']),
      },
      minimizationPerSecond: {
        median: Math.round(median(measured.schemes.minimization)),
        ratio: Number(throughput.rows[2].ratio!.toFixed(4)),
        rounds: rates(measured.schemes.minimization),
      },
      dryRun: {
        arrivals: DRY_RUN_ARRIVALS,
        baselineMs: Number(dryRunTable.rows[0].value.toFixed(3)),
        stratifiedBlocksMs: Number(dryRunTable.rows[1].value.toFixed(2)),
        stratifiedBlocksRatio: Number(dryRunTable.rows[1].ratio!.toFixed(1)),
        minimizationMs: Number(dryRunTable.rows[2].value.toFixed(2)),
        minimizationRatio: Number(dryRunTable.rows[2].ratio!.toFixed(1)),
      },
      seconds: Math.round((Date.now() - started) / 100) / 10,
    };
    console.log(JSON.stringify(summary));
    return 0;
  } finally {
    try {
      await app?.close();
    } finally {
      await database.dropAndDisconnect();
      log(`schema ${database.schema} dropped`);
    }
  }
}

runBenchmark('bench', main);
