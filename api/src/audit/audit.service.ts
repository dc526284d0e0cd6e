import { Injectable, Logger, OnApplicationBootstrap, OnApplicationShutdown, OnModuleInit } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { randomUUID } from 'node:crypto';
import { Pool } from 'pg';
import {
  DataSource,
  EntityManager,
  EntitySubscriberInterface,
  QueryRunner,
  TransactionCommitEvent,
  TransactionRollbackEvent,
} from 'typeorm';
import type { QueryDeepPartialEntity } from 'typeorm/query-builder/QueryPartialEntity';
import { AppConfig } from '../config/app-config';
import { AuditChainer } from './audit-chainer';
import {
  ChainBreak,
  ChainWalk,
  describeBreak,
  finishWalk,
  GENESIS_HASH,
  keyedEventHash,
  startWalk,
  StoredEvent,
  UNKEYED_SEAL_ACTION,
  walkChain,
} from './audit-hash';
import { AuditKeyRing, loadAuditKeys } from './audit-keys';
import { AuditReceiptDocument, checkReceipt, ReceiptProblem, RECEIPT_PROBLEM_TEXT } from './audit-receipt';
import { AuditTrailReadModel, TrailEvent } from './audit-trail.read-model';
import { AuditEventEntity, LAB_CHAIN } from './entities/audit-event.entity';
import { AuditReceiptEntity } from './entities/audit-receipt.entity';

export interface AuditActor {
  id: string | null;
  email: string | null;
}

export interface AuditRecord {
  /** A study id, or omitted for lab-wide events. */
  chain?: string;
  actor: AuditActor | null;
  action: string;
  subjectType?: string;
  subjectId?: string;
  data?: Record<string, unknown>;
}

export interface ChainVerdict {
  chain: string;
  events: number;
  intact: boolean;
  firstBreak: ChainBreak | null;
}

export interface AuditFinding {
  /** null when the finding is about the receipt itself. */
  chain: string | null;
  sequence: number | null;
  reason: string;
  message: string;
}

export interface ReceiptCheck {
  id: string | null;
  number: number | null;
  issuedAt: string | null;
  source: 'latest' | 'given';
  valid: boolean;
}

export interface AuditReport {
  intact: boolean;
  chains: ChainVerdict[];
  /** The receipt the chains were checked against: the latest issued, or the one given; null before the first. */
  receipt: ReceiptCheck | null;
  findings: AuditFinding[];
}

/** How deep in savepoints a query runner is (1: the outermost transaction). TypeORM keeps it on the runner. */
function transactionDepth(runner: QueryRunner): number {
  return (runner as QueryRunner & { transactionDepth?: number }).transactionDepth ?? 1;
}

@Injectable()
export class AuditService implements OnModuleInit, OnApplicationBootstrap, OnApplicationShutdown {
  private readonly logger = new Logger('Audit');
  /** Events recorded in a transaction that has not committed yet, with the savepoint depth they were recorded at. */
  private readonly pending = new WeakMap<QueryRunner, Array<{ record: AuditRecord; depth: number }>>();
  private readonly keys: AuditKeyRing;
  /** Chains each committed transaction wrote outbox rows for, sealed right after its commit. */
  private readonly written = new WeakMap<QueryRunner, string[]>();
  private readonly chainerPool: Pool;
  private readonly chainer: AuditChainer;
  private sweep: NodeJS.Timeout | null = null;

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    config: AppConfig,
    private readonly trail: AuditTrailReadModel,
  ) {
    this.keys = loadAuditKeys({
      keyList: config.auditKeys,
      keyFile: config.auditKeyFile,
      mayCreate: config.nodeEnv !== 'production',
    });
    this.chainerPool = new Pool({
      connectionString: config.databaseUrl,
      max: 2,
      application_name: 'evenhand-audit-chainer',
    });
    this.chainerPool.on('error', (error) => this.logger.error(`audit chainer connection: ${error.message}`));
    this.chainer = new AuditChainer(
      this.chainerPool,
      () => this.currentKey,
      (chain, error) =>
        this.logger.error(
          `Sealing chain ${chain} failed; its events wait in the outbox for the next seal: ${error.message}`,
        ),
    );
  }

  /** The key an event or receipt names, if this server holds it. */
  keyOf = (keyId: string): Buffer | undefined => this.keys.keys.get(keyId);

  /** The key new events and receipts are made with. */
  get currentKey(): { id: string; key: Buffer } {
    return { id: this.keys.currentId, key: this.keys.current };
  }

  async onApplicationBootstrap(): Promise<void> {
    await this.sealUnkeyedChains();
    await this.sealWaiting();
    // Rows left by a process that stopped between a commit and its seal, or by a failed seal.
    this.sweep = setInterval(
      () => void this.sealWaiting().catch((error: Error) => this.logger.error(error.message)),
      5000,
    );
    this.sweep.unref();
  }

  async onApplicationShutdown(): Promise<void> {
    if (this.sweep) clearInterval(this.sweep);
    await this.chainerPool.end();
  }

  /** Seals every chain with waiting outbox rows. */
  async sealWaiting(): Promise<void> {
    for (const chain of await this.chainer.waitingChains()) await this.chainer.seal(chain);
  }

  /**
   * Events written before events were keyed (key_id NULL) stay as they are (the table is append-only); each such
   * chain gets one keyed event that seals them: their count and a SHA-256 over every column of every one of them.
   * From then on a change to them is detected; a change made before the seal is not (see api/README.md).
   */
  async sealUnkeyedChains(): Promise<string[]> {
    const rows: Array<{ chain: string }> = await this.dataSource.query(
      `SELECT chain FROM (SELECT DISTINCT ON (chain) chain, key_id FROM audit_event ORDER BY chain, sequence DESC) head WHERE key_id IS NULL ORDER BY chain`,
    );
    const sealed: string[] = [];
    for (const { chain } of rows) {
      await this.dataSource.transaction(async (manager) => {
        await this.lockChain(manager, chain);
        const [head] = await manager.query(
          `SELECT key_id FROM audit_event WHERE chain = $1 ORDER BY sequence DESC LIMIT 1`,
          [chain],
        );
        if (!head || head.key_id !== null) return; // another process sealed it meanwhile
        let walk = startWalk();
        for await (const page of this.pagesOf(chain, manager))
          walk = walkChain(
            page.filter((e) => e.keyId === null),
            walk,
            this.keyOf,
          ).walk;
        await this.appendLocked(manager, chain, [
          {
            chain,
            actor: null,
            action: UNKEYED_SEAL_ACTION,
            subjectType: 'audit-chain',
            subjectId: chain,
            data: {
              unkeyedThrough: walk.unkeyedCount,
              unkeyedDigest: walk.unkeyedDigest,
              note: 'Events written before keying, sealed once with the current key.',
            },
          },
        ]);
        sealed.push(chain);
      });
    }
    if (sealed.length)
      this.logger.log(`Sealed the unkeyed events of ${sealed.length} chain(s) with key ${this.keys.currentId}`);
    return sealed;
  }

  /**
   * Records one event as part of the caller's transaction: it is written to the audit outbox just before the
   * transaction commits (one statement for all its events) and so exists exactly when the change does; right after
   * the commit the chain's chainer seals it into the chain (audit-chainer.ts), before the caller carries on. A
   * business transaction never takes a chain's lock. Outside a transaction it is recorded in one of its own.
   */
  async record(manager: EntityManager, record: AuditRecord): Promise<void> {
    const runner = manager.queryRunner;
    if (!runner?.isTransactionActive) {
      await this.dataSource.transaction((transactional) => this.record(transactional, record));
      return;
    }
    const queued = this.pending.get(runner) ?? [];
    queued.push({ record, depth: transactionDepth(runner) });
    this.pending.set(runner, queued);
  }

  /** Hooks into the data source's transactions: queued events go to the outbox before the outermost commit and are sealed after it. */
  onModuleInit(): void {
    const subscriber: EntitySubscriberInterface = {
      beforeTransactionCommit: async ({ queryRunner }: TransactionCommitEvent) => {
        if (transactionDepth(queryRunner) !== 1) return; // a savepoint: its events wait for the outer commit
        const queued = this.pending.get(queryRunner);
        if (!queued?.length) return;
        this.pending.delete(queryRunner);
        const records = queued.map((entry) => entry.record);
        await this.writeOutbox(queryRunner.manager, records);
        this.written.set(queryRunner, [...new Set(records.map((record) => record.chain ?? LAB_CHAIN))].sort());
      },
      afterTransactionCommit: async ({ queryRunner }: TransactionCommitEvent) => {
        const chains = this.written.get(queryRunner);
        if (!chains || transactionDepth(queryRunner) !== 0) return;
        this.written.delete(queryRunner);
        // Never throws: a failed seal leaves the rows in the outbox, and the sweep seals them.
        await Promise.all(chains.map((chain) => this.chainer.seal(chain)));
      },
      beforeTransactionRollback: ({ queryRunner }: TransactionRollbackEvent) => {
        // Rolling back to a savepoint drops only what was recorded inside it.
        const depth = transactionDepth(queryRunner);
        const kept = (this.pending.get(queryRunner) ?? []).filter((entry) => entry.depth < depth);
        if (kept.length) this.pending.set(queryRunner, kept);
        else this.pending.delete(queryRunner);
        if (depth === 1) this.written.delete(queryRunner);
      },
    };
    this.dataSource.subscribers.push(subscriber);
  }

  /** One statement for all of a transaction's events, in the order they were recorded. */
  private async writeOutbox(manager: EntityManager, records: AuditRecord[]): Promise<void> {
    const rows = records.map((record) => ({
      chain: record.chain ?? LAB_CHAIN,
      actorId: record.actor?.id ?? null,
      actorEmail: record.actor?.email ?? null,
      action: record.action,
      subjectType: record.subjectType ?? null,
      subjectId: record.subjectId ?? null,
      data: record.data ?? {},
    }));
    await manager.query(
      `INSERT INTO audit_outbox (chain, actor_id, actor_email, action, subject_type, subject_id, data)
       SELECT e->>'chain', (e->>'actorId')::uuid, e->>'actorEmail', e->>'action', e->>'subjectType', e->>'subjectId', e->'data'
       FROM jsonb_array_elements($1::jsonb) WITH ORDINALITY AS r(e, n) ORDER BY n`,
      [JSON.stringify(rows)],
    );
  }

  private async lockChain(manager: EntityManager, chain: string): Promise<void> {
    await manager.query(`SELECT pg_advisory_xact_lock(hashtextextended($1, 0))`, [`audit:${chain}`]);
  }

  /** Appends to one chain whose lock the transaction holds. */
  private async appendLocked(manager: EntityManager, chain: string, records: AuditRecord[]): Promise<void> {
    const [last] = await manager.query(
      `SELECT sequence, hash FROM audit_event WHERE chain = $1 ORDER BY sequence DESC LIMIT 1`,
      [chain],
    );
    let sequence: number = last ? Number(last.sequence) : 0;
    let previousHash: string = last?.hash ?? GENESIS_HASH;
    // Stamped under the lock, so a chain's times never go backwards as its sequence goes up.
    const at = new Date();
    const { id: keyId, key } = this.currentKey;
    const events = records.map((record) => {
      sequence += 1;
      const fields = {
        id: randomUUID(),
        chain,
        sequence,
        at: at.toISOString(),
        actorId: record.actor?.id ?? null,
        actorEmail: record.actor?.email ?? null,
        action: record.action,
        subjectType: record.subjectType ?? null,
        subjectId: record.subjectId ?? null,
        // Stored as jsonb and read back canonically: hash what the database will hand back.
        data: JSON.parse(JSON.stringify(record.data ?? {})) as Record<string, unknown>,
        previousHash,
        keyId,
      };
      const hash = keyedEventHash(key, fields);
      const event = manager.create(AuditEventEntity, { ...fields, at, hash });
      previousHash = hash;
      return event;
    });
    await manager.insert(AuditEventEntity, events as QueryDeepPartialEntity<AuditEventEntity>[]);
  }

  /** One participant's story in a study, in words, oldest first: their enrollment, steps, payouts and own actions. */
  async storyOf(studyId: string, reference: string): Promise<TrailEvent[]> {
    const { items } = await this.trail.page({ chain: studyId, participant: reference.toUpperCase() }, 1, 200);
    return items.reverse();
  }

  /** Checks chains (all when omitted) from their first link and against the latest audit receipt. */
  async verify(chains?: string[]): Promise<ChainVerdict[]> {
    return (await this.report({ chains })).chains;
  }

  /**
   * The full verdict: every chain walked from its first event (keys, links, sequence), then compared with a receipt
   * (the latest issued, or one an auditor hands in). Never throws on bad rows or a bad receipt: they are findings.
   */
  async report(options: { chains?: string[]; receipt?: unknown } = {}): Promise<AuditReport> {
    const findings: AuditFinding[] = [];
    let receipt: AuditReceiptDocument | null = null;
    let receiptCheck: ReceiptCheck | null = null;
    const given = options.receipt !== undefined;
    const candidate = given
      ? options.receipt
      : (await this.dataSource.getRepository(AuditReceiptEntity).findOne({ where: {}, order: { number: 'DESC' } }))
          ?.document;
    if (candidate !== undefined) {
      const problem: ReceiptProblem | null = checkReceipt(candidate, this.keyOf);
      const shaped = candidate as Partial<AuditReceiptDocument>;
      receiptCheck = {
        id: typeof shaped?.id === 'string' ? shaped.id : null,
        number: typeof shaped?.number === 'number' ? shaped.number : null,
        issuedAt: typeof shaped?.issuedAt === 'string' ? shaped.issuedAt : null,
        source: given ? 'given' : 'latest',
        valid: problem === null,
      };
      if (problem)
        findings.push({ chain: null, sequence: null, reason: problem, message: RECEIPT_PROBLEM_TEXT[problem] });
      else receipt = candidate as AuditReceiptDocument;
    }
    const heads = new Map((receipt?.chains ?? []).map((head) => [head.chain, head]));
    let names: string[] =
      options.chains ??
      (await this.dataSource.query(`SELECT DISTINCT chain FROM audit_event ORDER BY chain`)).map(
        (row: { chain: string }) => row.chain,
      );
    if (!options.chains) names = [...new Set([...names, ...heads.keys()])].sort();
    const verdicts: ChainVerdict[] = [];
    for (const chain of names) {
      const verdict = await this.verifyChain(chain, heads.get(chain) ?? null);
      verdicts.push(verdict);
      if (verdict.firstBreak) {
        findings.push({ chain, ...verdict.firstBreak, message: describeBreak(chain, verdict.firstBreak, receipt?.id) });
      }
    }
    return { intact: findings.length === 0, chains: verdicts, receipt: receiptCheck, findings };
  }

  private async verifyChain(
    chain: string,
    sealedHead: { sequence: number; hash: string } | null,
  ): Promise<ChainVerdict> {
    let walk: ChainWalk = startWalk();
    let count = 0;
    let hashAtSealedHead: string | null = null;
    for await (const page of this.pagesOf(chain)) {
      const result = walkChain(page, walk, this.keyOf);
      count += page.length;
      if (sealedHead) {
        const atHead = page.find((event) => event.sequence === sealedHead.sequence);
        if (atHead) hashAtSealedHead = atHead.hash;
      }
      if (result.broken) return { chain, events: count, intact: false, firstBreak: result.broken };
      walk = result.walk;
    }
    const firstBreak = finishWalk(walk) ?? this.compareWithReceipt(walk, sealedHead, hashAtSealedHead);
    return { chain, events: count, intact: firstBreak === null, firstBreak };
  }

  private compareWithReceipt(
    walk: ChainWalk,
    sealedHead: { sequence: number; hash: string } | null,
    hashAtSealedHead: string | null,
  ): ChainBreak | null {
    if (!sealedHead) return null;
    if (walk.sequence < sealedHead.sequence) return { sequence: walk.sequence + 1, reason: 'missing-after-receipt' };
    if (hashAtSealedHead !== sealedHead.hash) return { sequence: sealedHead.sequence, reason: 'receipt-mismatch' };
    return null;
  }

  /** One chain's events in sequence order, 5,000 at a time, as the hash sees them. */
  private async *pagesOf(
    chain: string,
    manager: EntityManager = this.dataSource.manager,
  ): AsyncGenerator<StoredEvent[]> {
    let after = 0;
    for (;;) {
      const rows: AuditEventEntity[] = await manager
        .getRepository(AuditEventEntity)
        .createQueryBuilder('event')
        .where('event.chain = :chain', { chain })
        .andWhere('event.sequence > :after', { after })
        .orderBy('event.sequence', 'ASC')
        .take(5000)
        .getMany();
      if (rows.length === 0) return;
      yield rows.map((row) => ({
        id: row.id,
        chain: row.chain,
        sequence: row.sequence,
        at: row.at.toISOString(),
        actorId: row.actorId,
        actorEmail: row.actorEmail,
        action: row.action,
        subjectType: row.subjectType,
        subjectId: row.subjectId,
        data: row.data,
        previousHash: row.previousHash,
        keyId: row.keyId,
        hash: row.hash,
      }));
      after = rows[rows.length - 1].sequence;
    }
  }
}
