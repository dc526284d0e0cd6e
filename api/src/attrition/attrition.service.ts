import { once } from 'node:events';
import type { Writable } from 'node:stream';
import { finished } from 'node:stream/promises';
import { Injectable, Logger } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { stringify } from 'csv-stringify';
import { DataSource, EntityManager } from 'typeorm';
import { AuditService } from '../audit';
import type { SessionUser } from '../common/auth/session-user';
import { ValidationException } from '../common/errors/domain.exception';
import type { StudyEntity } from '../studies';
import { StudiesService } from '../studies';
import { type ConsortFlow, type ReportArm, consortFlow, isRandomized, toReportInput } from './attrition-input';
import { type AttritionReport, buildAttritionReport } from './attrition-report';
import {
  type AttritionAggregates,
  type ContactRow,
  type ExportRow,
  type SqlRunner,
  readAttritionAggregates,
  readContactAggregates,
  readCovariateKeys,
  readExportPage,
} from './attrition-sql';
import { readSummaryAggregates } from './attrition-summary-sql';
import { REPEATED_LOOKS_CAUTION } from './alerts/alert-rules';
import { COUNTING_RULE } from './condition-counts';
import { contactParity } from './contact-parity';
import { WWC_ROW_RULE } from './wwc-verdict';
import { type PayParityResult, payParity } from './pay-parity';
import type {
  AttritionReportDto,
  ConsortFlowDto,
  ContactsByConditionDto,
  PayBasisDto,
} from './dto/attrition-report.dto';

export const WINDOW_RULE =
  'The participation window has ended for everyone once the study is closed; while it runs, for participants who completed, withdrew, were lost to follow-up or were excluded after randomization. Active participants are never counted as attrition before the study closes.';

const CAUTIONS = [
  'These figures are screening aids, not the study’s analysis: the analysis plan decides how attrition is handled.',
  'With small expected counts the dropout test is exact (Fisher, or Freeman–Halton for three or more conditions); otherwise chi-square, without a continuity correction.',
  'While the study runs, WWC attrition counts only participants whose participation window has ended; dropout so far counts active participants as not (yet) dropped.',
  'Every p-value here is recomputed each time the screen is opened: looking repeatedly makes a chance "significant" result more likely than its p suggests.',
];

const EXPORT_PAGE_SIZE = 2000;
const FIXED_COLUMNS = ['reference', 'condition', 'stratum'] as const;
const TRAILING_COLUMNS = [
  'status',
  'assigned_at',
  'completed_at',
  'dropped_out_at',
  'counted_as',
  'steps_done',
  'paid_minor',
  'earned_minor',
  'currency',
] as const;

interface StudyArms {
  study: StudyEntity;
  blinded: boolean;
  /** Condition id → name shown (code while blinded). */
  conditionNames: Map<string, string>;
}

/** Where the report's figures come from: the maintained summary, or a full pass over the study (the reference). */
export type ReportSource = 'summary' | 'full';

/** What the alert rules read off a report. */
export interface AttritionFigures {
  report: AttritionReport;
  earned: PayParityResult;
}

// OWASP "CSV injection": a cell a spreadsheet would read as a formula is prefixed with an apostrophe.
function spreadsheetSafe(value: string): string {
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

@Injectable()
export class AttritionService {
  private readonly logger = new Logger('Attrition');

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly studies: StudiesService,
    private readonly audit: AuditService,
  ) {}

  private async studyArms(studyId: string): Promise<StudyArms> {
    const study = await this.studies.require(studyId);
    const conditions = await this.studies.listConditions(studyId);
    const blinded = conditions.length > 0 ? conditions.some((c) => c.internalName === null) : study.blinded;
    return { study, blinded, conditionNames: new Map(conditions.map((c) => [c.id, c.internalName ?? c.code])) };
  }

  /** Between subjects: the study's conditions in order. Within subjects: each order anyone was given, by name. */
  private arms(context: StudyArms, flow: AttritionAggregates['flow']): ReportArm[] {
    if (context.study.design === 'between') {
      return [...context.conditionNames].map(([id, name]) => ({ id, name }));
    }
    const orders = [...new Set(flow.filter(isRandomized).map((row) => row.arm as string))];
    return orders
      .map((id) => ({ id, name: this.orderName(context, id) }))
      .sort((x, y) => x.name.localeCompare(y.name, 'en') || x.id.localeCompare(y.id));
  }

  private orderName(context: StudyArms, orderId: string): string {
    return orderId
      .split('>')
      .map((id) => context.conditionNames.get(id) ?? '?')
      .join(' → ');
  }

  private async readConsistently(
    study: StudyEntity,
    censorAt: Date,
    source: ReportSource,
  ): Promise<{ aggregates: AttritionAggregates; contacts: ContactRow[] }> {
    // One snapshot for every aggregate: the report cross-checks the survival and pay totals against the counts, and
    // compaction moves summary rows between tables while we read.
    return this.dataSource.transaction('REPEATABLE READ', async (manager: EntityManager) => {
      const run: SqlRunner = (sql, parameters) => manager.query(sql, parameters);
      const closed = study.status === 'closed';
      if (source === 'summary') return readSummaryAggregates(run, { id: study.id, closed }, censorAt);
      const aggregates = await readAttritionAggregates(
        run,
        { id: study.id, design: study.design, currency: study.currency, closed },
        censorAt,
      );
      return { aggregates, contacts: await readContactAggregates(run, { id: study.id, design: study.design }) };
    });
  }

  /** The whole dropout watch of one study, computed now. */
  async report(studyId: string, comparisonConditionId?: string): Promise<AttritionReportDto> {
    return (await this.compute(studyId, comparisonConditionId)).dto;
  }

  /**
   * The report and the raw figures behind it, for the alert rules. `source: 'full'` recomputes every figure from
   * the enrollments themselves (the reference the maintained summary is tested against); `now` fixes the moment.
   */
  async compute(
    studyId: string,
    comparisonConditionId?: string,
    { source = 'summary', now = new Date() }: { source?: ReportSource; now?: Date } = {},
  ): Promise<{ dto: AttritionReportDto; figures: AttritionFigures }> {
    const context = await this.studyArms(studyId);
    const { study } = context;
    const computedAt = now;
    const censorAt =
      study.status === 'closed' && study.closedAt && study.closedAt < computedAt ? study.closedAt : computedAt;
    const { aggregates, contacts } = await this.readConsistently(study, censorAt, source);
    const arms = this.arms(context, aggregates.flow);
    if (comparisonConditionId !== undefined && !arms.some((arm) => arm.id === comparisonConditionId)) {
      throw new ValidationException([
        {
          field: 'comparisonConditionId',
          message: `is not one of the study's ${study.design === 'within' ? 'orders' : 'conditions'}`,
        },
      ]);
    }

    const input = toReportInput(aggregates, arms, {
      studyClosed: study.status === 'closed',
      currency: study.currency,
      comparisonConditionId,
    });
    const report = buildAttritionReport(input.report);
    const earned = payParity({ ...input.earned, comparisonConditionId: report.wwc.comparisonConditionId ?? undefined });
    const names = new Map(arms.map((arm) => [arm.id, arm.name]));
    const nameOf = (id: string) => names.get(id) as string;
    const cautions = [...CAUTIONS];
    if (study.design === 'within')
      cautions.push('Within-subjects study: each order of conditions is reported as one arm.');
    if (context.blinded) cautions.push('The study is blinded: conditions are shown by code until it is unblinded.');

    const dto: AttritionReportDto = {
      studyId,
      design: study.design,
      studyStatus: study.status,
      computedAt: computedAt.toISOString(),
      blinded: context.blinded,
      windowRule: WINDOW_RULE,
      countingRule: COUNTING_RULE,
      wwcRowRule: WWC_ROW_RULE,
      repeatedLooks: REPEATED_LOOKS_CAUTION,
      plannedSize: study.targetSize,
      cautions,
      conditions: report.conditions.map((condition) => ({ ...condition, name: nameOf(condition.conditionId) })),
      overall: report.overall,
      differentialAttrition: report.differentialAttrition,
      wwc: report.wwc,
      dropoutTest: {
        ...report.dropoutTest,
        tableConditionIds: report.conditions.filter((c) => c.randomized > 0).map((c) => c.conditionId),
      },
      survival: {
        timeUnit: 'days',
        censoredAt: censorAt.toISOString(),
        curves: report.survival.curves.map(({ conditionId, atStart, confidenceLevel, bandForm, median, steps }) => ({
          conditionId,
          atStart,
          confidenceLevel,
          bandForm,
          median,
          points: steps.map(({ time, survival, lower, upper, standardError, atRisk, dropped, censored }) => ({
            time,
            survival,
            lower,
            upper,
            standardError,
            atRisk,
            events: dropped,
            censored,
          })),
        })),
        logRank: report.survival.logRank,
        cox: report.survival.cox,
        plannedLength: report.survival.plannedLength,
      },
      stratified: report.stratified,
      payParity: {
        currency: report.payParity.currency,
        payOverrideRecorded: report.payParity.payOverrideRecorded,
        paid: this.payBasis(report.payParity),
        earned: this.payBasis(earned),
      },
      covariateBalance: report.covariateBalance,
      flow: this.flowDto(consortFlow(aggregates.flow, arms, study.status === 'closed'), nameOf),
      contacts: this.contacts(contacts, arms, nameOf),
    };
    return { dto, figures: { report, earned } };
  }

  private contacts(rows: ContactRow[], arms: ReportArm[], nameOf: (id: string) => string): ContactsByConditionDto {
    const byArm = new Map(rows.map((r) => [r.arm, r]));
    const parity = contactParity(
      arms.map((arm) => {
        const row = byArm.get(arm.id);
        return {
          conditionId: arm.id,
          total: { n: row?.randomized ?? 0, sum: row?.contacts_sum ?? 0, sumOfSquares: row?.contacts_squares ?? 0 },
          reminders: row?.reminders ?? 0,
          reconsentRequests: row?.reconsent_requests ?? 0,
          staffMessages: row?.staff_messages ?? 0,
        };
      }),
    );
    return { ...parity, conditions: parity.conditions.map((c) => ({ ...c, name: nameOf(c.conditionId) })) };
  }

  private payBasis(result: PayParityResult): PayBasisDto {
    return { conditions: result.conditions, perRandomized: result.perRandomized, perCompleter: result.perCompleter };
  }

  private flowDto(flow: ConsortFlow, nameOf: (id: string) => string): ConsortFlowDto {
    return { ...flow, arms: flow.arms.map((arm) => ({ ...arm, name: nameOf(arm.conditionId) })) };
  }

  /**
   * Writes the study's data set as CSV to `out`, one row per enrollment, page by page in reference order, waiting
   * whenever the client is slower than the database; never more than one page in memory.
   */
  async writeExport(
    actor: SessionUser,
    studyId: string,
    out: Writable,
    begin: () => void = () => undefined,
  ): Promise<void> {
    const context = await this.studyArms(studyId);
    const { study } = context;
    const run: SqlRunner = (sql, parameters) => this.dataSource.query(sql, parameters);
    const covariateKeys = await readCovariateKeys(run, studyId);
    const taken = new Set<string>([...FIXED_COLUMNS, ...TRAILING_COLUMNS]);
    const covariateColumns = covariateKeys.map((key) => ({ key, header: taken.has(key) ? `covariate_${key}` : key }));
    await this.audit.record(this.dataSource.manager, {
      chain: studyId,
      actor,
      action: 'study.exported',
      subjectType: 'study',
      subjectId: studyId,
      data: { format: 'csv', covariates: covariateKeys, blinded: context.blinded },
    });

    const csv = stringify({
      header: true,
      columns: [...FIXED_COLUMNS, ...covariateColumns.map((column) => column.header), ...TRAILING_COLUMNS],
      cast: { date: (value) => value.toISOString(), boolean: (value) => String(value) },
    });
    begin();
    csv.pipe(out);
    const record = (row: ExportRow): Record<string, unknown> => {
      const values: Record<string, unknown> = {
        reference: row.reference,
        condition:
          row.arm === null
            ? ''
            : spreadsheetSafe(
                study.design === 'within'
                  ? this.orderName(context, row.arm)
                  : (context.conditionNames.get(row.arm) ?? '?'),
              ),
        stratum: row.stratum_key ?? '',
        status: row.status,
        assigned_at: row.assigned_at,
        completed_at: row.completed_at,
        dropped_out_at: row.dropped_out_at,
        counted_as: row.counted_as,
        steps_done: row.steps_done,
        paid_minor: row.paid_minor,
        earned_minor: row.earned_minor,
        currency: study.currency,
      };
      for (const { key, header } of covariateColumns) {
        const value = row.covariates[key];
        values[header] =
          typeof value === 'string'
            ? spreadsheetSafe(value)
            : value === null || value === undefined
              ? ''
              : typeof value === 'object'
                ? JSON.stringify(value)
                : value;
      }
      return values;
    };

    // A client that goes away must not leave this loop waiting for a drain that never comes.
    const gone = new AbortController();
    const onClose = () => gone.abort();
    out.once('close', onClose);
    try {
      let after: string | null = null;
      for (;;) {
        const closedAt = study.status === 'closed' ? (study.closedAt ?? new Date()) : null;
        const page: ExportRow[] = await readExportPage(
          run,
          { id: study.id, design: study.design, currency: study.currency, closedAt },
          after,
          EXPORT_PAGE_SIZE,
        );
        for (const row of page) {
          if (gone.signal.aborted) throw new Error('the client closed the connection');
          if (!csv.write(record(row))) await once(csv, 'drain', { signal: gone.signal });
        }
        if (page.length < EXPORT_PAGE_SIZE) break;
        after = page[page.length - 1].reference;
      }
      csv.end();
      await finished(out);
    } catch (error) {
      this.logger.error(
        `Export of study ${studyId} stopped: ${error instanceof Error ? error.message : String(error)}`,
      );
      csv.destroy();
      out.destroy();
    } finally {
      out.off('close', onClose);
    }
  }
}
