// Everything one stand-in process remembers. Held in memory; when PAYMENTS_FAKE_STATE_FILE is set
// the state saver (state-saver.ts) also keeps a copy on disk, told of changes through onChange.
// POST /_control/reset starts it afresh.

import type Stripe from 'stripe';
import { Timers } from '../app/timers';
import { Clock } from '../clock/clock';
import { EventLog, type EventRequest, type NewEvent } from '../events/event-log';
import { FaultSwitches } from '../faults/fault-switches';
import { objectId } from '../ids/object-id';
import { IdempotencyStore } from '../idempotency/idempotency-store';
import { Ledger } from '../ledger/ledger';
import { WebhookDispatcher, type WebhookEndpoint } from '../webhooks/webhook-dispatcher';
import { Collection } from './collection';

/** The API version the stand-in answers with when a request names none. */
export const DEFAULT_API_VERSION = '2026-10-28.endive';

export interface AccountLinkRecord {
  token: string;
  accountId: string;
  type: 'account_onboarding' | 'account_update';
  refreshUrl: string;
  returnUrl: string;
  createdAt: number;
  expiresAt: number;
  used: boolean;
}

export interface OnboardingSessionRecord {
  id: string;
  linkToken: string;
  accountId: string;
  refreshUrl: string;
  returnUrl: string;
  expiresAt: number;
  finished: boolean;
}

export interface ProviderWorldOptions {
  publicUrl: string;
  webhook: WebhookEndpoint;
  webhookRetryDelaysMs: readonly number[];
  webhookReorderWindowMs: number;
  webhookTimeoutMs: number;
  /** How long card top-ups stay pending before they become available (0: at once). */
  fundsPendingMs: number;
  /** How long a payout stays pending before it is paid. */
  payoutSettleMs: number;
  onboardingLinkTtlSeconds: number;
  onboardingSessionTtlSeconds: number;
}

/** 'change': something may have changed; 'reset': everything was just forgotten. */
export type WorldChange = 'change' | 'reset';

export class ProviderWorld {
  readonly clock = new Clock();
  readonly ledger = new Ledger();
  readonly idempotency = new IdempotencyStore();
  readonly faults = new FaultSwitches();
  readonly timers = new Timers(() => this.noteChange());
  readonly dispatcher: WebhookDispatcher;
  readonly events: EventLog;

  private platformId = objectId('acct', 16);
  /** Cancels the one timer waiting for the earliest pending funds. */
  private cancelFundsRelease: (() => void) | undefined;
  private readonly changeListeners = new Set<(change: WorldChange) => void>();
  private durableStore: (() => Promise<void>) | undefined;
  readonly platformCountry = 'US';
  readonly platformCurrency = 'usd';

  readonly accounts = new Collection<Stripe.Account>();
  readonly accountLinks = new Map<string, AccountLinkRecord>();
  readonly onboardingSessions = new Map<string, OnboardingSessionRecord>();
  readonly transfers = new Collection<Stripe.Transfer>();
  /** Transfer id → its reversals in creation order. */
  readonly transferReversals = new Map<string, Stripe.TransferReversal[]>();
  readonly payouts = new Collection<Stripe.Payout>();
  /** Payout id → the account whose balance pays it (the platform or a connected account). */
  readonly payoutAccounts = new Map<string, string>();
  readonly paymentIntents = new Collection<Stripe.PaymentIntent>();

  /** Base of hosted page links; set once the server knows its address. */
  publicUrl: string;

  constructor(readonly options: ProviderWorldOptions) {
    this.publicUrl = options.publicUrl.replace(/\/+$/, '');
    this.dispatcher = new WebhookDispatcher({
      endpoint: options.webhook,
      retryDelaysMs: options.webhookRetryDelaysMs,
      reorderWindowMs: options.webhookReorderWindowMs,
      timeoutMs: options.webhookTimeoutMs,
      faults: () => this.faults.webhook,
      onDelivered: (eventId) => this.events.markDelivered(eventId),
      onAttempt: () => this.noteChange(),
      // An event is only told about once what it describes is on disk.
      beforeDelivery: () => this.durable(),
    });
    this.events = new EventLog(this.clock, DEFAULT_API_VERSION, (event) => this.dispatcher.enqueue(event));
  }

  /** The platform's own account id; random for a new world, kept by the state file across restarts. */
  get platformAccountId(): string {
    return this.platformId;
  }

  /** Only for restoring a saved world. */
  restorePlatformAccountId(id: string): void {
    this.platformId = id;
  }

  /** Listens for changes; returns the function that stops listening. */
  onChange(listener: (change: WorldChange) => void): () => void {
    this.changeListeners.add(listener);
    return () => this.changeListeners.delete(listener);
  }

  /** Called after anything that may have changed the world (a request, a timer, a delivery). */
  noteChange(): void {
    for (const listener of this.changeListeners) listener('change');
  }

  /** Who makes the world durable (the state saver); none keeps it in memory only. */
  useDurableStore(store: (() => Promise<void>) | undefined): void {
    this.durableStore = store;
  }

  /** Resolves once what the world holds now would survive a crash; at once when it lives in memory only. */
  durable(): Promise<void> {
    return this.durableStore ? this.durableStore() : Promise.resolve();
  }

  emit(event: NewEvent): void {
    this.events.emit(event);
  }

  /** The currency an account's balance shows when it has never held money. */
  defaultCurrencyOf(accountId: string): string {
    if (accountId === this.platformAccountId) return this.platformCurrency;
    return this.accounts.get(accountId)?.default_currency ?? this.platformCurrency;
  }

  /** Keeps one timer for the earliest pending funds; when it fires it releases what is due and sets the next. */
  scheduleFundsRelease(): void {
    this.cancelFundsRelease?.();
    this.cancelFundsRelease = undefined;
    const next = this.ledger.nextReleaseMs();
    if (next === undefined) return;
    this.cancelFundsRelease = this.timers.after(Math.max(0, next - this.clock.nowMs()), () => {
      this.cancelFundsRelease = undefined;
      this.releaseDueFunds(this.clock.nowMs());
      // Later funds need a timer of their own, and a timer can fire a millisecond before the clock reaches
      // the due time (Node's timers run on the event loop's cached time), leaving those funds still pending.
      this.scheduleFundsRelease();
    });
  }

  releaseDueFunds(nowMs: number, request?: EventRequest): void {
    const released = this.ledger.releaseDue(nowMs);
    const accountsTouched = new Set(released.map((funds) => funds.accountId));
    for (const accountId of accountsTouched) {
      const isPlatform = accountId === this.platformAccountId;
      this.emit({
        type: 'balance.available',
        object: {
          object: 'balance',
          livemode: false,
          ...this.ledger.split(accountId, this.defaultCurrencyOf(accountId)),
        },
        account: isPlatform ? undefined : accountId,
        request,
      });
    }
  }

  reset(): void {
    this.timers.clearAll();
    this.cancelFundsRelease = undefined;
    this.dispatcher.clear();
    this.clock.reset();
    this.ledger.clear();
    this.idempotency.clear();
    this.faults.clear();
    this.events.clear();
    this.accounts.clear();
    this.accountLinks.clear();
    this.onboardingSessions.clear();
    this.transfers.clear();
    this.transferReversals.clear();
    this.payouts.clear();
    this.payoutAccounts.clear();
    this.paymentIntents.clear();
    for (const listener of this.changeListeners) listener('reset');
  }

  close(): void {
    this.timers.clearAll();
    this.dispatcher.stop();
  }
}
