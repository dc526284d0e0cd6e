import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';

/** Paid this year by one participant of a study, across every study, with their e-mail. */
export interface YearPaidRow {
  participant_id: string;
  email: string;
  paid: string;
}

/** One line of the finance office's export: a participant's payments in the period and in that year. */
export interface FinanceExportRow {
  reference: string;
  n: string;
  paid: string;
  year_paid: string;
}

/** The finance office's reads: paid per participant across studies (payout joined to account and enrollment). */
@Injectable()
export class FinanceReadModel {
  constructor(@InjectDataSource() private readonly dataSource: DataSource) {}

  /** Year-to-date paid per participant of this study, across all studies, in the study's currency. */
  async paidThisYear(studyId: string, currency: string, year: number): Promise<YearPaidRow[]> {
    return this.dataSource.query(
      `SELECT p.participant_id, u.email, sum(p.amount_minor) AS paid
       FROM payout p JOIN user_account u ON u.id = p.participant_id
       WHERE p.status = 'paid' AND p.currency = $2 AND p.paid_at >= make_timestamptz($3, 1, 1, 0, 0, 0, 'UTC')
         AND p.participant_id IN (SELECT participant_id FROM payout WHERE study_id = $1)
       GROUP BY 1, 2 ORDER BY paid DESC`,
      [studyId, currency, year],
    );
  }

  /** Per participant: what this study paid in [from, end), and what they were paid from `yearStart` to `end`. */
  async periodExport(
    studyId: string,
    currency: string,
    period: { from: Date; end: Date; yearStart: Date },
  ): Promise<FinanceExportRow[]> {
    return this.dataSource.query(
      `WITH period AS (
         SELECT p.participant_id, min(e.reference) AS reference, count(*) AS n, sum(p.amount_minor) AS paid
         FROM payout p JOIN enrollment e ON e.id = p.enrollment_id
         WHERE p.study_id = $1 AND p.status = 'paid' AND p.paid_at >= $2 AND p.paid_at < $3
         GROUP BY p.participant_id
       )
       SELECT period.reference, period.n, period.paid,
              (SELECT coalesce(sum(y.amount_minor), 0) FROM payout y
                WHERE y.participant_id = period.participant_id AND y.status = 'paid' AND y.currency = $5 AND y.paid_at >= $4 AND y.paid_at < $3) AS year_paid
       FROM period ORDER BY period.reference`,
      [studyId, period.from, period.end, period.yearStart, currency],
    );
  }
}
