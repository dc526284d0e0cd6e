import { Injectable } from '@nestjs/common';
import { ValidationException } from '../common/errors/domain.exception';
import type { SessionUser } from '../common/auth/session-user';
import { personPhrase } from './audit-sentences';
import { ChainCheck, csvHeader, csvRows, sha256Hex, verificationSummary } from './audit-trail-export';
import { AuditTrailReadModel, TrailEvent } from './audit-trail.read-model';
import { AuditSelection, exportFileName, selectionInWords, selectionProblems } from './audit-trail-selection';
import { AuditFinding, AuditReport, AuditService } from './audit.service';
import { LAB_CHAIN } from './entities/audit-event.entity';

export interface DescribedFinding extends AuditFinding {
  studyTitle: string | null;
  event: { at: string; name: string; sentence: string } | null;
}

/** The audit trail as people read it: filtered pages, the export with its verification summary, findings in words. */
@Injectable()
export class AuditTrailService {
  constructor(
    private readonly readModel: AuditTrailReadModel,
    private readonly audit: AuditService,
  ) {}

  async page(
    selection: AuditSelection,
    page: number,
    pageSize: number,
  ): Promise<{ items: TrailEvent[]; total: number }> {
    this.refuseBadWindow(selection);
    return this.readModel.page(selection, page, pageSize);
  }

  filterOptions() {
    return this.readModel.filterOptions();
  }

  /** The selection as CSV (byte-order mark, newest first) and the name it is saved under. */
  async exportCsv(
    selection: AuditSelection,
    now = new Date(),
  ): Promise<{ fileName: string; body: string; listed: number }> {
    this.refuseBadWindow(selection);
    let body = csvHeader();
    let listed = 0;
    for await (const events of this.readModel.all(selection)) {
      body += csvRows(events);
      listed += events.length;
    }
    return { fileName: exportFileName(await this.scopeOf(selection), now, 'csv'), body, listed };
  }

  /** The study the file is named after: the one asked for, or the only study the selected events belong to. */
  private async scopeOf(selection: AuditSelection): Promise<string> {
    if (selection.chain === LAB_CHAIN) return 'lab';
    let chain = selection.chain;
    if (!chain) {
      const studies = [...(await this.readModel.counts(selection)).byChain.keys()].filter((name) => name !== LAB_CHAIN);
      if (studies.length !== 1) return 'all-studies';
      chain = studies[0];
    }
    return (await this.readModel.studyTitles([chain])).get(chain)?.slug ?? 'study';
  }

  /**
   * The verification summary of the same selection: it names the CSV it goes with and that file's SHA-256, the
   * counts, and the verdict of every chain in the selection against the latest audit receipt.
   */
  async exportSummary(
    actor: SessionUser,
    selection: AuditSelection,
    now = new Date(),
  ): Promise<{ fileName: string; body: string }> {
    const csv = await this.exportCsv(selection, now);
    const counts = await this.readModel.counts(selection);
    const chains = [...new Set([...counts.byChain.keys(), ...(selection.chain ? [selection.chain] : [])])].sort();
    const report = await this.audit.report({ chains });
    const titles = await this.readModel.studyTitles(chains);
    const findings = await this.describeFindings(report);
    const checks: ChainCheck[] = report.chains.map((verdict) => {
      const finding = findings.find((f) => f.chain === verdict.chain);
      return {
        chain: verdict.chain,
        label: verdict.chain === LAB_CHAIN ? 'Lab-wide' : (titles.get(verdict.chain)?.title ?? verdict.chain),
        eventsInChain: verdict.events,
        eventsListed: counts.byChain.get(verdict.chain) ?? 0,
        intact: verdict.intact,
        firstFailure: finding
          ? `${finding.message}${finding.event ? ` It reads: ${finding.event.sentence}` : ''}`
          : null,
      };
    });
    const options = await this.readModel.filterOptions();
    const staff = selection.staff ? options.staff.find((person) => person.id === selection.staff) : undefined;
    const body = verificationSummary({
      exportedAt: now,
      exportedBy: personPhrase(actor),
      fileName: csv.fileName,
      fileSha256: sha256Hex(csv.body),
      selection: selectionInWords(selection, {
        study: selection.chain ? (titles.get(selection.chain)?.title ?? null) : null,
        staff: staff ? `${staff.phrase} (${staff.email})` : null,
      }),
      listed: counts.total,
      byAction: counts.byAction,
      chains: checks,
      receipt: report.receipt,
      receiptProblem: findings.find((f) => f.chain === null)?.message ?? null,
    });
    return { fileName: exportFileName(await this.scopeOf(selection), now, 'txt', '-verification'), body };
  }

  /** Each finding with the study it concerns and, when the event is still stored, that event in words. */
  async describeFindings(report: AuditReport): Promise<DescribedFinding[]> {
    const titles = await this.readModel.studyTitles(report.findings.flatMap((f) => (f.chain ? [f.chain] : [])));
    const described: DescribedFinding[] = [];
    for (const finding of report.findings) {
      const event =
        finding.chain !== null && finding.sequence !== null
          ? await this.readModel.eventAt(finding.chain, finding.sequence)
          : null;
      described.push({
        ...finding,
        studyTitle: finding.chain ? (titles.get(finding.chain)?.title ?? null) : null,
        event: event ? { at: event.at.toISOString(), name: event.name, sentence: event.sentence } : null,
      });
    }
    return described;
  }

  private refuseBadWindow(selection: AuditSelection): void {
    const problems = selectionProblems(selection);
    if (problems.length) throw new ValidationException(problems, 'The date range ends before it starts.');
  }
}
