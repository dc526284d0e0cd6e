import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';

/** The payouts domain's filter for the Pay page; `stageSql` is its own condition on `p` and `a` (see pay-totals.ts). */
export interface PayoutQueueFilter {
  status?: string;
  stageSql?: string;
  conditionId?: string;
  enrollmentId?: string;
  search?: string;
  sort?: keyof typeof SORT_ORDER;
  page: number;
  pageSize: number;
}

/** One payout on the Pay page with the participant reference, the step's title and whether their account is ready. */
export interface PayoutQueueRow {
  id: string;
  enrollment_id: string;
  condition_id: string | null;
  kind: 'step' | 'bonus';
  amount_minor: string | number;
  currency: string;
  pay_override: boolean;
  status: string;
  failure_reason: string | null;
  receipt_number: string | null;
  provider_transfer_id: string | null;
  created_at: Date;
  approved_at: Date | null;
  paid_at: Date | null;
  reference: string;
  step_title: string | null;
  account_ready: boolean;
}

const SORT_ORDER = {
  newest: 'p.created_at DESC, p.id',
  oldest: 'p.created_at ASC, p.id',
  'amount-desc': 'p.amount_minor DESC, p.created_at DESC, p.id',
  'amount-asc': 'p.amount_minor ASC, p.created_at DESC, p.id',
  participant: 'e.reference ASC, p.created_at DESC, p.id',
} as const;

/** A study's payouts as the Pay page lists them (payout joined to enrollment, step completion, step and account). */
@Injectable()
export class PayoutQueueReadModel {
  constructor(@InjectDataSource() private readonly dataSource: DataSource) {}

  async page(studyId: string, filter: PayoutQueueFilter): Promise<{ rows: PayoutQueueRow[]; total: number }> {
    const where: string[] = ['p.study_id = $1'];
    const params: unknown[] = [studyId];
    if (filter.status) where.push(`p.status = $${params.push(filter.status)}`);
    if (filter.stageSql) where.push(filter.stageSql);
    if (filter.conditionId) where.push(`p.condition_id = $${params.push(filter.conditionId)}`);
    if (filter.enrollmentId) where.push(`p.enrollment_id = $${params.push(filter.enrollmentId)}`);
    const search = filter.search?.trim();
    if (search) {
      const n = params.push(`%${search.replace(/[\\%_]/g, (c) => `\\${c}`)}%`);
      where.push(`(e.reference ILIKE $${n} OR s.title ILIKE $${n} OR p.receipt_number ILIKE $${n})`);
    }
    const from = `FROM payout p
       JOIN enrollment e ON e.id = p.enrollment_id
       LEFT JOIN step_completion c ON c.id = p.step_completion_id
       LEFT JOIN step s ON s.id = c.step_id
       LEFT JOIN payout_account a ON a.user_id = p.participant_id
       WHERE ${where.join(' AND ')}`;
    const [{ total }] = await this.dataSource.query(`SELECT count(*) AS total ${from}`, params);
    const rows: PayoutQueueRow[] = await this.dataSource.query(
      `SELECT p.*, e.reference, s.title AS step_title, coalesce(a.payouts_enabled, false) AS account_ready ${from}
       ORDER BY ${SORT_ORDER[filter.sort ?? 'newest']} LIMIT ${filter.pageSize} OFFSET ${(filter.page - 1) * filter.pageSize}`,
      params,
    );
    return { rows, total: Number(total) };
  }
}
