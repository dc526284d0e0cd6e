import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import Stripe from 'stripe';
import { DataSource, EntityManager } from 'typeorm';
import { PayoutException } from './payout.exception';
import { AppConfig } from '../config/app-config';
import { queryRows } from '../database/raw-query';
import { PaymentsService } from '../payments/payments.service';
import { FundingService } from './funding.service';
import { PayoutAccountsService } from './payout-accounts.service';
import { PayoutSendingService } from './payout-sending.service';
import { APPLIED_EVENT_TYPES, ProviderEventEnvelope, readProviderEvent, signatureTimeProblem } from './provider-event';

/** The payment provider's webhooks: verified, stored once, and applied in order per object. */
@Injectable()
export class ProviderWebhooksService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly config: AppConfig,
    private readonly payments: PaymentsService,
    private readonly sending: PayoutSendingService,
    private readonly funding: FundingService,
    private readonly accounts: PayoutAccountsService,
  ) {}

  private get provider(): Stripe {
    return this.payments.client;
  }

  /**
   * Verifies and applies one webhook. A bad signature, or one stamped more than five minutes from our clock either
   * way, changes nothing; so does a malformed event (400 naming the field), an event seen before, and an event older
   * than the last one applied to the same object (the provider does not promise delivery order, and each event
   * carries its object's whole state at that moment, so applying a stale one would undo a newer state).
   */
  async handleWebhook(
    rawBody: Buffer | undefined,
    signature: string | undefined,
  ): Promise<{ received: true; duplicate: boolean }> {
    if (!rawBody || !signature) {
      throw new PayoutException('VALIDATION_FAILED', 'A signed webhook body is required.', [
        { field: 'Stripe-Signature', message: 'is missing' },
      ]);
    }
    let body: unknown;
    try {
      body = this.provider.webhooks.constructEvent(rawBody, signature, this.config.stripeWebhookSecret, 300);
    } catch (error) {
      if (error instanceof SyntaxError) {
        throw new PayoutException('VALIDATION_FAILED', 'The webhook body is not JSON.', [
          { field: 'body', message: 'must be a JSON event' },
        ]);
      }
      throw new PayoutException('VALIDATION_FAILED', 'The webhook signature does not verify.', [
        { field: 'Stripe-Signature', message: (error as Error).message },
      ]);
    }
    const timeProblem = signatureTimeProblem(signature, Math.floor(Date.now() / 1000));
    if (timeProblem) {
      throw new PayoutException('VALIDATION_FAILED', 'The webhook signature is stamped outside the accepted window.', [
        { field: 'Stripe-Signature', message: timeProblem },
      ]);
    }
    const read = readProviderEvent(body);
    if ('errors' in read)
      throw new PayoutException('VALIDATION_FAILED', 'The webhook event is malformed.', read.errors);
    const { event } = read;
    return this.dataSource.transaction(async (manager) => {
      const inserted = await queryRows(
        manager,
        // Stored as processed: it is applied in this same transaction, so either both happen or neither.
        `INSERT INTO provider_event (provider_event_id, type, created_at_provider, payload, processed_at, object_id) VALUES ($1, $2, to_timestamp($3), $4, now(), $5)
         ON CONFLICT (provider_event_id) DO NOTHING RETURNING id`,
        [event.id, event.type, event.created, JSON.stringify(body), event.objectId],
      );
      if (inserted.length === 0) return { received: true as const, duplicate: true };
      if (APPLIED_EVENT_TYPES.has(event.type)) {
        if (await this.isNewestFor(manager, event)) await this.apply(manager, event);
        else await manager.query(`UPDATE provider_event SET applied = false WHERE provider_event_id = $1`, [event.id]);
      }
      return { received: true as const, duplicate: false };
    });
  }

  /**
   * Records this event as the newest applied to its object unless a newer one already was. The row stays locked
   * until the transaction ends, so two events about one object are applied one after the other; a tie (the same
   * second) is applied in arrival order.
   */
  private async isNewestFor(manager: EntityManager, event: ProviderEventEnvelope): Promise<boolean> {
    const rows = await queryRows(
      manager,
      `INSERT INTO provider_object_version (object_id, object_type, last_event_id, last_event_created_at) VALUES ($1, $2, $3, to_timestamp($4))
       ON CONFLICT (object_id) DO UPDATE SET last_event_id = excluded.last_event_id, last_event_created_at = excluded.last_event_created_at, updated_at = now()
         WHERE provider_object_version.last_event_created_at <= excluded.last_event_created_at
       RETURNING object_id`,
      [event.objectId, String(event.object.object ?? event.type.split('.')[0]), event.id, event.created],
    );
    return rows.length > 0;
  }

  private async apply(manager: EntityManager, event: ProviderEventEnvelope): Promise<void> {
    switch (event.type) {
      case 'account.updated':
        await this.accounts.updateAccountState(manager, event.object as unknown as Stripe.Account);
        return;
      case 'transfer.created':
      case 'transfer.updated':
      case 'transfer.reversed':
        await this.sending.settleFromTransfer(event.object as unknown as Stripe.Transfer, manager);
        return;
      case 'payment_intent.succeeded':
      case 'payment_intent.payment_failed':
        await this.funding.applyFunding(
          manager,
          event.objectId!,
          event.type === 'payment_intent.succeeded' ? 'succeeded' : 'failed',
        );
        return;
      default:
        return;
    }
  }
}
