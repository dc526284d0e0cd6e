import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager } from 'typeorm';
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

@Injectable()
export class AuditService {
  constructor(@InjectDataSource() private readonly dataSource: DataSource) {}

  /**
   * Appends one event to its chain inside the caller's transaction. The transaction-scoped advisory lock is per
   * chain, so events of different studies never wait on each other; it is released when the caller commits.
   */
  async record(manager: EntityManager, record: AuditRecord): Promise<AuditEventEntity> {
    if (!manager.queryRunner?.isTransactionActive) {
      return this.dataSource.transaction((transactional) => this.record(transactional, record));
    }
    const chain = record.chain ?? LAB_CHAIN;
    await manager.query(`SELECT pg_advisory_xact_lock(hashtextextended($1, 0))`, [`audit:${chain}`]);
    const [last] = await manager.query(
      `SELECT sequence, hash FROM audit_event WHERE chain = $1 ORDER BY sequence DESC LIMIT 1`,
      [chain],
    );
    const fields = {
      chain,
      sequence: last ? Number(last.sequence) + 1 : 1,
      at: new Date().toISOString(),
      actorId: record.actor?.id ?? null,
      action: record.action,
      subjectType: record.subjectType ?? null,
      subjectId: record.subjectId ?? null,
      data: record.data ?? {},
    };
    const previousHash: string = last?.hash ?? GENESIS_HASH;
    const event = manager.create(AuditEventEntity, {
      ...fields,
      at: new Date(fields.at),
      actorEmail: record.actor?.email ?? null,
      previousHash,
      hash: chainHash(previousHash, fields),
    });
    return manager.save(event);
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
