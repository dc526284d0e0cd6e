import { Injectable, OnModuleInit } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager, EntitySubscriberInterface, QueryRunner, TransactionCommitEvent, TransactionRollbackEvent } from 'typeorm';
import type { QueryDeepPartialEntity } from 'typeorm/query-builder/QueryPartialEntity';
import { chainHash, findChainBreak, GENESIS_HASH } from './audit-hash';
import { AuditEventEntity, LAB_CHAIN } from './entities/audit-event.entity';

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
  firstBreak: { sequence: number; reason: string } | null;
}

export interface AuditPageQuery {
  chains: string[] | 'all';
  action?: string;
  subjectIds?: string[];
  page: number;
  pageSize: number;
}

/** How deep in savepoints a query runner is (1: the outermost transaction). TypeORM keeps it on the runner. */
function transactionDepth(runner: QueryRunner): number {
  return (runner as QueryRunner & { transactionDepth?: number }).transactionDepth ?? 1;
}

@Injectable()
export class AuditService implements OnModuleInit {
  /** Events recorded in a transaction that has not committed yet, with the savepoint depth they were recorded at. */
  private readonly pending = new WeakMap<QueryRunner, Array<{ record: AuditRecord; depth: number }>>();

  constructor(@InjectDataSource() private readonly dataSource: DataSource) {}

  /**
   * Records one event as part of the caller's transaction. Inside a transaction the event is appended just before
   * it commits (see onModuleInit): the chain's lock is then held only for the append and the commit, not for the
   * rest of the caller's work, and an event of a rolled-back transaction is never written. Outside a transaction it
   * is appended at once in a transaction of its own.
   */
  async record(manager: EntityManager, record: AuditRecord): Promise<void> {
    const runner = manager.queryRunner;
    if (!runner?.isTransactionActive) {
      await this.dataSource.transaction((transactional) => this.append(transactional, [record]));
      return;
    }
    const queued = this.pending.get(runner) ?? [];
    queued.push({ record, depth: transactionDepth(runner) });
    this.pending.set(runner, queued);
  }

  /** Hooks into the data source's transactions: queued events are appended before the outermost commit. */
  onModuleInit(): void {
    const subscriber: EntitySubscriberInterface = {
      beforeTransactionCommit: async ({ queryRunner }: TransactionCommitEvent) => {
        if (transactionDepth(queryRunner) !== 1) return; // a savepoint: its events wait for the outer commit
        const queued = this.pending.get(queryRunner);
        if (!queued?.length) return;
        this.pending.delete(queryRunner);
        await this.append(queryRunner.manager, queued.map((entry) => entry.record));
      },
      beforeTransactionRollback: ({ queryRunner }: TransactionRollbackEvent) => {
        // Rolling back to a savepoint drops only what was recorded inside it.
        const depth = transactionDepth(queryRunner);
        const kept = (this.pending.get(queryRunner) ?? []).filter((entry) => entry.depth < depth);
        if (kept.length) this.pending.set(queryRunner, kept);
        else this.pending.delete(queryRunner);
      },
    };
    this.dataSource.subscribers.push(subscriber);
  }

  /**
   * Appends events to their chains in the given transaction. Chains are locked in name order, so two transactions
   * that touch the same chains cannot wait on each other in a circle; each lock is released at commit.
   */
  private async append(manager: EntityManager, records: AuditRecord[]): Promise<void> {
    const chains = [...new Set(records.map((record) => record.chain ?? LAB_CHAIN))].sort();
    for (const chain of chains) {
      await manager.query(`SELECT pg_advisory_xact_lock(hashtextextended($1, 0))`, [`audit:${chain}`]);
      const [last] = await manager.query(`SELECT sequence, hash FROM audit_event WHERE chain = $1 ORDER BY sequence DESC LIMIT 1`, [chain]);
      let sequence: number = last ? Number(last.sequence) : 0;
      let previousHash: string = last?.hash ?? GENESIS_HASH;
      // Stamped under the lock, so a chain's times never go backwards as its sequence goes up.
      const at = new Date();
      const events = records
        .filter((record) => (record.chain ?? LAB_CHAIN) === chain)
        .map((record) => {
          sequence += 1;
          const fields = {
            chain,
            sequence,
            at: at.toISOString(),
            actorId: record.actor?.id ?? null,
            action: record.action,
            subjectType: record.subjectType ?? null,
            subjectId: record.subjectId ?? null,
            data: record.data ?? {},
          };
          const hash = chainHash(previousHash, fields);
          const event = manager.create(AuditEventEntity, { ...fields, at, actorEmail: record.actor?.email ?? null, previousHash, hash });
          previousHash = hash;
          return event;
        });
      await manager.insert(AuditEventEntity, events as QueryDeepPartialEntity<AuditEventEntity>[]);
    }
  }

  async page(query: AuditPageQuery): Promise<{ items: AuditEventEntity[]; total: number }> {
    const builder = this.dataSource.getRepository(AuditEventEntity).createQueryBuilder('event');
    if (query.chains !== 'all') builder.where('event.chain IN (:...chains)', { chains: query.chains.length ? query.chains : [''] });
    if (query.action) builder.andWhere('event.action = :action', { action: query.action });
    if (query.subjectIds) builder.andWhere('event.subject_id IN (:...subjectIds)', { subjectIds: query.subjectIds.length ? query.subjectIds : [''] });
    const [items, total] = await builder
      .orderBy('event.at', 'DESC')
      .addOrderBy('event.sequence', 'DESC')
      .skip((query.page - 1) * query.pageSize)
      .take(query.pageSize)
      .getManyAndCount();
    return { items, total };
  }

  /** Re-computes every chain from its first link; reads chain by chain in pages so memory stays flat. */
  async verify(chains?: string[]): Promise<ChainVerdict[]> {
    const names: string[] =
      chains ??
      (await this.dataSource.query(`SELECT DISTINCT chain FROM audit_event ORDER BY chain`)).map(
        (row: { chain: string }) => row.chain,
      );
    const verdicts: ChainVerdict[] = [];
    for (const chain of names) verdicts.push(await this.verifyChain(chain));
    return verdicts;
  }

  private async verifyChain(chain: string): Promise<ChainVerdict> {
    const repository = this.dataSource.getRepository(AuditEventEntity);
    const pageSize = 5000;
    let previous: { sequence: number; hash: string } | null = null;
    let count = 0;
    for (;;) {
      const rows: AuditEventEntity[] = await repository
        .createQueryBuilder('event')
        .where('event.chain = :chain', { chain })
        .andWhere('event.sequence > :after', { after: previous?.sequence ?? 0 })
        .orderBy('event.sequence', 'ASC')
        .take(pageSize)
        .getMany();
      if (rows.length === 0) break;
      const links: Parameters<typeof findChainBreak>[0] = rows.map((row) => ({
        chain: row.chain,
        sequence: row.sequence,
        at: row.at.toISOString(),
        actorId: row.actorId,
        action: row.action,
        subjectType: row.subjectType,
        subjectId: row.subjectId,
        data: row.data,
        previousHash: row.previousHash,
        hash: row.hash,
      }));
      const firstBreak = findChainBreak(links, previous ?? undefined);
      count += rows.length;
      if (firstBreak) return { chain, events: count, intact: false, firstBreak };
      const last: { sequence: number; hash: string } = links[links.length - 1];
      previous = { sequence: last.sequence, hash: last.hash };
    }
    return { chain, events: count, intact: true, firstBreak: null };
  }
}
