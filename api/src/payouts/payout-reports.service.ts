import { Injectable } from '@nestjs/common';
import { PayoutException } from './payout.exception';
import { AppConfig } from '../config/app-config';
import { FinanceReadModel } from '../reporting';
import { StudiesService } from '../studies';
import { FinanceExportQueryDto, TaxThresholdDto } from './dto/payout.dto';
import { financeExportCsv, financeExportFileName, thresholdStanding } from './finance-export';

export const TAX_CAUTION =
  'Tax reporting rules differ by country and institution. This threshold is a screening aid: follow your institution’s finance office.';

/** What the finance office needs: paid per participant against the tax-reporting threshold, and the period export. */
@Injectable()
export class PayoutReportsService {
  constructor(
    private readonly config: AppConfig,
    private readonly studies: StudiesService,
    private readonly finance: FinanceReadModel,
  ) {}

  /** Year-to-date paid per participant of this study (across all studies), against the reporting threshold. */
  async taxThreshold(studyId: string): Promise<TaxThresholdDto> {
    const study = await this.studies.require(studyId);
    const year = new Date().getUTCFullYear();
    const rows = await this.finance.paidThisYear(studyId, study.currency, year);
    const threshold = this.config.taxReportingThresholdMinor;
    return {
      year,
      thresholdMinor: threshold,
      currency: study.currency,
      caution: TAX_CAUTION,
      participants: rows.map((r) => {
        const paid = Number(r.paid);
        return {
          participantId: r.participant_id,
          email: r.email,
          paidThisYearMinor: paid,
          standing: thresholdStanding(paid, threshold),
        };
      }),
    };
  }

  /**
   * The finance office's CSV for a period: per participant of this study, what this study paid them in the period
   * and what they were paid in that calendar year across every study (up to the period's end), against the
   * tax-reporting threshold. Pay and tax rules are the institution's finance office's to apply.
   */
  async financeExport(studyId: string, query: FinanceExportQueryDto): Promise<{ fileName: string; csv: Buffer }> {
    const study = await this.studies.require(studyId);
    const from = parseDay(query.from, 'from');
    const to = parseDay(query.to, 'to');
    if (to < from)
      throw new PayoutException('VALIDATION_FAILED', 'The period ends before it starts.', [
        { field: 'to', message: 'must be on or after the first day (from)' },
      ]);
    if (to.getTime() - from.getTime() > 366 * 86_400_000) {
      throw new PayoutException('VALIDATION_FAILED', 'A period can be at most a year long.', [
        { field: 'to', message: 'must be within a year of the first day (from)' },
      ]);
    }
    const end = new Date(to.getTime() + 86_400_000);
    const yearStart = new Date(Date.UTC(to.getUTCFullYear(), 0, 1));
    const rows = await this.finance.periodExport(studyId, study.currency, { from, end, yearStart });
    const csv = financeExportCsv(
      rows.map((r) => ({
        participantReference: r.reference,
        paymentsInPeriod: Number(r.n),
        paidInPeriodMinor: Number(r.paid),
        paidThisYearMinor: Number(r.year_paid),
      })),
      study.currency.trim(),
      this.config.taxReportingThresholdMinor,
    );
    return { fileName: financeExportFileName(study.slug, query.from, query.to), csv };
  }
}

/** A YYYY-MM-DD day as midnight UTC; an impossible day (2026-02-30) is refused by field. */
function parseDay(value: string, field: string): Date {
  const day = new Date(`${value}T00:00:00.000Z`);
  if (Number.isNaN(day.getTime()) || day.toISOString().slice(0, 10) !== value) {
    throw new PayoutException('VALIDATION_FAILED', `${field} is not a real calendar day.`, [
      { field, message: `${value} is not a real calendar day` },
    ]);
  }
  return day;
}
