import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager } from 'typeorm';
import { AuditActor, AuditService } from '../audit';
import { AppConfig } from '../config/app-config';
import { PaymentsService } from '../payments/payments.service';
import { StudiesService } from '../studies';
import { BudgetDto, FundingIntentDto } from './dto/payout.dto';
import { StudyFundingEntity } from './entities/study-funding.entity';
import { PayoutException } from './payout.exception';
import { PayoutsService } from './payouts.service';

/** Funding a study through the provider, and the budget that funding makes available for approvals. */
@Injectable()
export class FundingService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly config: AppConfig,
    private readonly audit: AuditService,
    private readonly payments: PaymentsService,
    private readonly studies: StudiesService,
    private readonly ledger: PayoutsService,
  ) {}

  async createFunding(actor: AuditActor, studyId: string, amountMinor: number): Promise<FundingIntentDto> {
    const study = await this.studies.require(studyId);
    if (study.status === 'closed') throw new PayoutException('STUDY_CLOSED', 'A closed study takes no more funding.');
    const intent = await this.payments.call('the funding', (provider) =>
      provider.paymentIntents.create({
        amount: amountMinor,
        currency: study.currency.trim().toLowerCase(),
        allowed_payment_method_types: ['card'],
        description: `Funding for ${study.title}`,
        metadata: { studyId, purpose: 'study-funding' },
      }),
    );
    const funding = await this.dataSource.transaction(async (manager) => {
      const saved = await manager.save(
        manager.create(StudyFundingEntity, {
          studyId,
          paymentIntentId: intent.id,
          amountMinor,
          currency: study.currency,
          status: 'pending',
          createdBy: actor.id,
        }),
      );
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'funding.started',
        subjectType: 'funding',
        subjectId: saved.id,
        data: { amountMinor, paymentIntentId: intent.id },
      });
      return saved;
    });
    return {
      fundingId: funding.id,
      clientSecret: intent.client_secret!,
      publishableKey: this.config.stripePublishableKey,
      scriptUrl: this.config.stripeScriptUrl,
      amountMinor,
      currency: study.currency,
    };
  }

  /** Asks the provider directly, for when the browser says it succeeded before the webhook arrives. */
  async refreshFunding(studyId: string, fundingId: string): Promise<BudgetDto> {
    const funding = await this.dataSource
      .getRepository(StudyFundingEntity)
      .findOne({ where: { id: fundingId, studyId } });
    if (!funding) throw new PayoutException('NOT_FOUND', 'No such funding for this study.');
    const intent = await this.payments.call('checking the funding', (provider) =>
      provider.paymentIntents.retrieve(funding.paymentIntentId),
    );
    if (intent.status === 'succeeded' || intent.status === 'canceled') {
      await this.dataSource.transaction((manager) =>
        this.applyFunding(manager, intent.id, intent.status === 'succeeded' ? 'succeeded' : 'failed'),
      );
    }
    return this.budget(studyId);
  }

  async budget(studyId: string): Promise<BudgetDto> {
    const study = await this.studies.require(studyId);
    const totals = await this.ledger.balance(this.dataSource.manager, studyId);
    const fundings = await this.dataSource
      .getRepository(StudyFundingEntity)
      .find({ where: { studyId }, order: { createdAt: 'DESC' } });
    return {
      currency: study.currency,
      plannedMinor: study.budgetMinor,
      ...totals,
      fundings: fundings.map((f) => ({
        id: f.id,
        amountMinor: f.amountMinor,
        status: f.status,
        createdAt: f.createdAt.toISOString(),
        succeededAt: f.succeededAt?.toISOString() ?? null,
      })),
    };
  }

  /** Records the provider's answer about a funding payment once; a funding that succeeded stays so. */
  async applyFunding(manager: EntityManager, paymentIntentId: string, status: 'succeeded' | 'failed'): Promise<void> {
    const funding = await manager.findOne(StudyFundingEntity, {
      where: { paymentIntentId },
      lock: { mode: 'pessimistic_write' },
    });
    if (!funding || funding.status === 'succeeded') return;
    await manager.update(
      StudyFundingEntity,
      { id: funding.id },
      { status, succeededAt: status === 'succeeded' ? new Date() : null },
    );
    await this.audit.record(manager, {
      chain: funding.studyId,
      actor: null,
      action: status === 'succeeded' ? 'funding.received' : 'funding.declined',
      subjectType: 'funding',
      subjectId: funding.id,
      data: { amountMinor: funding.amountMinor, paymentIntentId },
    });
  }
}
