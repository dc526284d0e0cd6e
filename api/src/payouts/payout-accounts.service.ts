import { Injectable, Logger } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import Stripe from 'stripe';
import { DataSource, EntityManager } from 'typeorm';
import type { SessionUser } from '../common/auth/session-user';
import { AppConfig } from '../config/app-config';
import { PaymentsService } from '../payments/payments.service';
import { ParticipantPayoutsReadModel } from '../reporting';
import { MyPayoutsDto, OnboardingLinkDto, PayoutAccountStatusDto } from './dto/payout.dto';
import { PayoutAccountEntity } from './entities/payout-account.entity';
import { PayoutEntity } from './entities/payout.entity';

/** The participant's side: their payout account at the provider (set-up and state) and their own payouts. */
@Injectable()
export class PayoutAccountsService {
  private readonly logger = new Logger('Payouts');

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly config: AppConfig,
    private readonly payments: PaymentsService,
    private readonly participantPayouts: ParticipantPayoutsReadModel,
  ) {}

  private get provider(): Stripe {
    return this.payments.client;
  }

  /** Stores what the provider says of an account: can it be paid, has the person finished setting it up. */
  async updateAccountState(manager: EntityManager, account: Stripe.Account): Promise<void> {
    const enabled = Boolean(account.payouts_enabled) && account.capabilities?.transfers === 'active';
    await manager.update(
      PayoutAccountEntity,
      { providerAccountId: account.id },
      { payoutsEnabled: enabled, onboardingState: account.details_submitted ? 'complete' : 'started' },
    );
  }

  async accountStatus(user: SessionUser, refresh = true): Promise<PayoutAccountStatusDto> {
    const account = await this.dataSource.getRepository(PayoutAccountEntity).findOne({ where: { userId: user.id } });
    if (!account) return { exists: false, payoutsEnabled: false, onboarding: 'none' };
    if (refresh && !account.payoutsEnabled) {
      try {
        await this.dataSource.transaction(async (manager) =>
          this.updateAccountState(manager, await this.provider.accounts.retrieve(account.providerAccountId)),
        );
      } catch (error) {
        this.logger.warn(`could not refresh account ${account.providerAccountId}: ${(error as Error).message}`);
      }
    }
    const current = (await this.dataSource.getRepository(PayoutAccountEntity).findOne({ where: { userId: user.id } }))!;
    return { exists: true, payoutsEnabled: current.payoutsEnabled, onboarding: current.onboardingState };
  }

  /** Creates the participant's connected account on first use and a fresh single-use onboarding link. */
  async startOnboarding(user: SessionUser): Promise<OnboardingLinkDto> {
    let account = await this.dataSource.getRepository(PayoutAccountEntity).findOne({ where: { userId: user.id } });
    if (!account) {
      const created = await this.payments.call('setting up your payout account', (provider) =>
        provider.accounts.create(
          {
            type: 'express',
            email: user.email,
            capabilities: { transfers: { requested: true } },
            metadata: { userId: user.id },
          },
          { idempotencyKey: `payout-account-${user.id}` },
        ),
      );
      await this.dataSource.query(
        `INSERT INTO payout_account (user_id, provider_account_id) VALUES ($1, $2) ON CONFLICT (user_id) DO NOTHING`,
        [user.id, created.id],
      );
      account = (await this.dataSource.getRepository(PayoutAccountEntity).findOne({ where: { userId: user.id } }))!;
    }
    const providerAccountId = account.providerAccountId;
    const link = await this.payments.call('opening the payout set-up page', (provider) =>
      provider.accountLinks.create({
        account: providerAccountId,
        refresh_url: new URL('/payouts?onboarding=expired', this.config.portalUrl).toString(),
        return_url: new URL('/payouts?onboarding=done', this.config.portalUrl).toString(),
        type: 'account_onboarding',
      }),
    );
    return { url: link.url, account: await this.accountStatus(user, false) };
  }

  async myPayouts(user: SessionUser): Promise<MyPayoutsDto> {
    const rows = await this.participantPayouts.of(user.id);
    const year = new Date().getUTCFullYear();
    const paidThisYearMinor: Record<string, number> = {};
    const pendingMinor: Record<string, number> = {};
    for (const r of rows) {
      const currency = (r.currency as string).trim();
      if (r.status === 'paid' && (r.paid_at as Date).getUTCFullYear() === year)
        paidThisYearMinor[currency] = (paidThisYearMinor[currency] ?? 0) + Number(r.amount_minor);
      if (['owed', 'approved', 'sending', 'failed'].includes(r.status as string))
        pendingMinor[currency] = (pendingMinor[currency] ?? 0) + Number(r.amount_minor);
    }
    return {
      items: rows.map((r) => ({
        id: r.id as string,
        studyTitle: r.study_title as string,
        stepTitle: (r.step_title as string | null) ?? null,
        kind: r.kind as 'step' | 'bonus',
        amountMinor: Number(r.amount_minor),
        currency: (r.currency as string).trim(),
        status: r.status as PayoutEntity['status'],
        createdAt: (r.created_at as Date).toISOString(),
        paidAt: r.paid_at ? (r.paid_at as Date).toISOString() : null,
        receipt: r.status === 'paid' ? (r.receipt_number as string | null) : null,
      })),
      account: await this.accountStatus(user),
      paidThisYearMinor,
      pendingMinor,
      taxNote:
        'Payments for taking part in research can count as income. Rules differ by country; if you are unsure, ask a tax adviser.',
    };
  }
}
