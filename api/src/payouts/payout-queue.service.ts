import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import Stripe from 'stripe';
import { DataSource } from 'typeorm';
import { PaymentsService } from '../payments/payments.service';
import { PayoutQueueReadModel } from '../reporting';
import { StudiesService } from '../studies';
import { PayoutPageDto, PayoutQueryDto, ReconciliationDto } from './dto/payout.dto';
import { PayoutEntity } from './entities/payout.entity';
import { stageCondition, stageOf } from './pay-totals';
import { PayoutsService } from './payouts.service';
import { reconcile } from './reconcile';

/** The Pay page's list of a study's payouts with its totals, and the ledger checked against the provider's transfers. */
@Injectable()
export class PayoutQueueService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly payments: PaymentsService,
    private readonly studies: StudiesService,
    private readonly ledger: PayoutsService,
    private readonly queue: PayoutQueueReadModel,
  ) {}

  async list(studyId: string, query: PayoutQueryDto): Promise<PayoutPageDto> {
    await this.studies.require(studyId);
    const labels = new Map((await this.studies.listConditions(studyId)).map((c) => [c.id, c.internalName ?? c.code]));
    const { rows, total } = await this.queue.page(studyId, {
      status: query.status,
      stageSql: query.stage ? stageCondition(query.stage) : undefined,
      conditionId: query.conditionId,
      enrollmentId: query.enrollmentId,
      search: query.search,
      sort: query.sort,
      page: query.page,
      pageSize: query.pageSize,
    });
    const totals = await this.ledger.payTotals(this.dataSource.manager, studyId);
    return {
      items: rows.map((r) => ({
        id: r.id as string,
        enrollmentId: r.enrollment_id as string,
        reference: r.reference as string,
        condition: r.condition_id ? (labels.get(r.condition_id as string) ?? null) : null,
        kind: r.kind as 'step' | 'bonus',
        stepTitle: (r.step_title as string | null) ?? null,
        amountMinor: Number(r.amount_minor),
        currency: (r.currency as string).trim(),
        payOverride: r.pay_override as boolean,
        status: r.status as PayoutEntity['status'],
        stage: stageOf(r.status as PayoutEntity['status'], r.account_ready as boolean),
        failureReason: (r.failure_reason as string | null) ?? null,
        receiptNumber: (r.receipt_number as string | null) ?? null,
        providerTransferId: (r.provider_transfer_id as string | null) ?? null,
        payoutAccountReady: r.account_ready as boolean,
        createdAt: (r.created_at as Date).toISOString(),
        approvedAt: r.approved_at ? (r.approved_at as Date).toISOString() : null,
        paidAt: r.paid_at ? (r.paid_at as Date).toISOString() : null,
      })),
      total,
      page: query.page,
      pageSize: query.pageSize,
      countsByStatus: totals.countsByStatus,
      amountByStatus: totals.amountByStatus,
      stages: totals.stages,
    };
  }

  async reconciliation(studyId: string): Promise<ReconciliationDto> {
    await this.studies.require(studyId);
    // Every page, however many: the SDK's autoPagingToArray stops at 10,000 items.
    const transfers: Stripe.Transfer[] = [];
    await this.payments.call('the reconciliation', async (provider) => {
      for await (const transfer of provider.transfers.list({ transfer_group: `study_${studyId}`, limit: 100 }))
        transfers.push(transfer);
    });
    const ledger = await this.dataSource.getRepository(PayoutEntity).find({ where: { studyId } });
    return reconcile(
      ledger.map((p) => ({ id: p.id, status: p.status, amountMinor: p.amountMinor, transferId: p.providerTransferId })),
      transfers.map((t) => ({
        id: t.id,
        amountMinor: t.amount,
        reversed: t.reversed,
        payoutId: t.metadata?.payoutId ?? null,
      })),
    );
  }
}
