import { Injectable, Logger, OnModuleInit } from '@nestjs/common';
import { ModuleRef } from '@nestjs/core';
import { InjectDataSource } from '@nestjs/typeorm';
import { randomUUID } from 'node:crypto';
import { DataSource, EntityManager } from 'typeorm';
import { AuditException } from './audit.exception';
import { AppConfig } from '../config/app-config';
import { JOB_NAMES, JobQueueService } from '../jobs/job-queue.service';
import { MailService } from '../mail/mail.service';
import { AuditReceiptDocument, ChainHead, sealReceipt } from './audit-receipt';
import { AuditActor, AuditService } from './audit.service';
import { AuditReceiptEntity } from './entities/audit-receipt.entity';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/**
 * Issues audit receipts: on a schedule (skipped when no chain moved since the last one) and on demand. Each receipt
 * is stored (append-only) and e-mailed to the auditors, so a copy exists outside the database.
 */
@Injectable()
export class AuditReceiptsService implements OnModuleInit {
  private readonly logger = new Logger('AuditReceipts');

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly config: AppConfig,
    private readonly audit: AuditService,
    private readonly jobs: JobQueueService,
    private readonly mail: MailService,
    private readonly moduleRef: ModuleRef,
  ) {}

  async onModuleInit(): Promise<void> {
    await this.jobs.handle<{ receiptId?: string }>(JOB_NAMES.auditReceipt, async ({ receiptId }) => {
      if (receiptId) await this.mailReceipt(receiptId);
      else await this.issue('scheduled', null);
    });
    if (this.config.auditReceiptCron) await this.jobs.schedule(JOB_NAMES.auditReceipt, this.config.auditReceiptCron);
    else await this.jobs.unschedule(JOB_NAMES.auditReceipt);
  }

  /**
   * Seals every chain's head into a new receipt. Only receipts are serialised (their own lock); appends to the
   * chains go on, and an event committed meanwhile is simply in the next receipt.
   */
  async issue(reason: 'scheduled' | 'on-demand', actor: AuditActor | null): Promise<AuditReceiptDocument | null> {
    return this.dataSource.transaction(async (manager) => {
      await manager.query(`SELECT pg_advisory_xact_lock(hashtextextended('audit-receipt', 0))`);
      const last = await manager.getRepository(AuditReceiptEntity).findOne({ where: {}, order: { number: 'DESC' } });
      const heads = await this.heads(manager);
      if (reason === 'scheduled' && last && sameHeads(last.document.chains, heads)) return null;
      const { id: keyId, key } = this.audit.currentKey;
      const document = sealReceipt(key, {
        id: randomUUID(),
        number: (last?.number ?? 0) + 1,
        issuedAt: new Date().toISOString(),
        reason,
        previous: last ? { id: last.id, mac: last.mac } : null,
        chains: heads,
        keyId,
      });
      await manager.insert(AuditReceiptEntity, {
        id: document.id,
        number: document.number,
        issuedAt: new Date(document.issuedAt),
        reason,
        issuedByEmail: actor?.email ?? null,
        keyId,
        document,
        mac: document.mac,
      });
      if (actor) {
        await this.audit.record(manager, {
          actor,
          action: 'audit.receipt-issued',
          subjectType: 'audit-receipt',
          subjectId: document.id,
          data: { number: document.number, chains: heads.length },
        });
      }
      await this.jobs.enqueue(manager, JOB_NAMES.auditReceipt, { receiptId: document.id });
      return document;
    });
  }

  private async heads(manager: EntityManager): Promise<ChainHead[]> {
    const rows: Array<{ chain: string; sequence: number; hash: string; at: Date }> = await manager.query(
      `SELECT DISTINCT ON (chain) chain, sequence, hash, at FROM audit_event ORDER BY chain, sequence DESC`,
    );
    return rows.map((row) => ({
      chain: row.chain,
      sequence: Number(row.sequence),
      hash: row.hash,
      at: new Date(row.at).toISOString(),
    }));
  }

  async list(): Promise<Array<{ id: string; number: number; issuedAt: string; reason: string; chains: number }>> {
    const rows = await this.dataSource.getRepository(AuditReceiptEntity).find({ order: { number: 'DESC' }, take: 100 });
    return rows.map((row) => ({
      id: row.id,
      number: row.number,
      issuedAt: row.issuedAt.toISOString(),
      reason: row.reason,
      chains: row.document.chains.length,
    }));
  }

  async get(id: string): Promise<AuditReceiptDocument> {
    const row = UUID.test(id)
      ? await this.dataSource.getRepository(AuditReceiptEntity).findOne({ where: { id } })
      : null;
    if (!row) throw new AuditException('NOT_FOUND', 'There is no audit receipt with this id.');
    return row.document;
  }

  /** Sends the receipt to every active staff auditor and every study member who audits a study in it. */
  private async mailReceipt(receiptId: string): Promise<void> {
    const receipt = await this.get(receiptId);
    const recipients = await this.auditors(receipt.chains.map((head) => head.chain));
    const json = JSON.stringify(receipt, null, 2);
    for (const to of recipients) {
      await this.mail.deliver({
        to,
        subject: `Evenhand audit receipt no. ${receipt.number}`,
        text:
          `Audit receipt ${receipt.id} (no. ${receipt.number}, ${receipt.reason}) seals the heads of ${receipt.chains.length} audit chain(s) as of ${receipt.issuedAt}.\n\n` +
          'Keep the attached file. Handing it to "Verify against a receipt" (POST /api/audit/verify) shows whether any event it covers was later removed or rewritten.\n',
        attachments: [
          {
            filename: `audit-receipt-${receipt.number}.json`,
            content: Buffer.from(json),
            contentType: 'application/json',
          },
        ],
      });
    }
    this.logger.log(`Audit receipt ${receipt.number} sent to ${recipients.length} auditor(s)`);
  }

  private async auditors(chains: string[]): Promise<string[]> {
    // Loaded when a receipt is sent: audit sits below every domain, so studies and users must not load with it.
    const [{ UsersService }, { StudiesService }] = await Promise.all([import('../users'), import('../studies')]);
    const users = this.moduleRef.get(UsersService, { strict: false });
    const studies = this.moduleRef.get(StudiesService, { strict: false });
    const addresses = new Set<string>();
    for (let page = 1; ; page++) {
      const staff = await users.listStaff({ page, pageSize: 100 } as never);
      for (const user of staff.items)
        if (user.role === 'auditor' && user.active) addresses.add(user.email.toLowerCase());
      if (page * 100 >= staff.total) break;
    }
    for (const chain of chains) {
      if (!UUID.test(chain) || !(await studies.exists(chain))) continue;
      for (const member of (await studies.listMembers(chain)).items)
        if (member.role === 'auditor') addresses.add(member.email.toLowerCase());
    }
    return [...addresses].sort();
  }
}

function sameHeads(a: ChainHead[], b: ChainHead[]): boolean {
  const key = (heads: ChainHead[]) =>
    heads
      .map((h) => `${h.chain}:${h.sequence}:${h.hash}`)
      .sort()
      .join('|');
  return key(a) === key(b);
}
