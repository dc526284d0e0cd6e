// Delivers events to the configured endpoint the way the provider does
// (https://docs.stripe.com/webhooks): a JSON POST signed in the Stripe-Signature header, a 2xx
// answer counts as received, anything else is retried later with growing delays. The fault
// switches can duplicate, delay or reorder deliveries.

import { Timers } from '../app/timers';
import type { ProviderEvent } from '../events/event-log';
import type { WebhookFaults } from '../faults/fault-switches';
import { SIGNATURE_HEADER, signatureHeaderValue } from './webhook-signature';

export interface WebhookEndpoint {
  url: string | null;
  secret: string;
}

export interface WebhookDispatcherOptions {
  endpoint: WebhookEndpoint;
  /** Delay before each retry; the length is the number of retries after the first attempt. */
  retryDelaysMs: readonly number[];
  /** How long reordered events are gathered before going out last-first. */
  reorderWindowMs: number;
  timeoutMs: number;
  faults: () => WebhookFaults;
  onDelivered: (eventId: string) => void;
  /** Told after each attempt is logged (delivered or not). */
  onAttempt?: () => void;
  /** Awaited before each attempt goes out (the world: until its state is on disk). */
  beforeDelivery?: () => Promise<void>;
}

/** What the dispatcher remembers beyond its queue: the attempt log and the events already received. */
export interface DispatcherSnapshot {
  attempts: DeliveryAttempt[];
  delivered: string[];
}

export interface DeliveryAttempt {
  eventId: string;
  type: string;
  attempt: number;
  copy: 'original' | 'duplicate';
  status: number | null;
  error: string | null;
  at: string;
}

export const WEBHOOK_USER_AGENT = 'Stripe/1.0 (+https://stripe.com/docs/webhooks)';

interface Delivery {
  event: ProviderEvent;
  copy: DeliveryAttempt['copy'];
}

export class WebhookDispatcher {
  private readonly timers = new Timers();
  private readonly inFlight = new Set<Promise<void>>();
  private readonly attempts: DeliveryAttempt[] = [];
  private readonly delivered = new Set<string>();
  private reorderBatch: Delivery[] = [];
  private idleWaiters: Array<() => void> = [];
  private generation = 0;

  constructor(private readonly options: WebhookDispatcherOptions) {}

  get enabled(): boolean {
    return Boolean(this.options.endpoint.url);
  }

  /** Queues an event; returns how many endpoints will receive it (the event's pending_webhooks). */
  enqueue(event: ProviderEvent): number {
    if (!this.enabled) return 0;
    const faults = this.options.faults();
    const deliveries: Delivery[] = [{ event, copy: 'original' }];
    if (faults.duplicate) deliveries.push({ event, copy: 'duplicate' });
    for (const delivery of deliveries) {
      if (faults.reorder) this.addToReorderBatch(delivery);
      else this.schedule(delivery, faults.delayMs, 1);
    }
    return 1;
  }

  private addToReorderBatch(delivery: Delivery): void {
    if (this.reorderBatch.length === 0) {
      this.timers.after(this.options.reorderWindowMs, () => {
        const batch = this.reorderBatch.reverse();
        this.reorderBatch = [];
        const delayMs = this.options.faults().delayMs;
        batch.forEach((queued, index) => this.schedule(queued, delayMs + index, 1));
        this.settleIfIdle();
      });
    }
    this.reorderBatch.push(delivery);
  }

  private schedule(delivery: Delivery, delayMs: number, attempt: number): void {
    this.timers.after(delayMs, () => this.send(delivery, attempt));
  }

  private send(delivery: Delivery, attempt: number): void {
    const generation = this.generation;
    const work = this.post(delivery, attempt, generation).finally(() => {
      this.inFlight.delete(work);
      this.settleIfIdle();
    });
    this.inFlight.add(work);
  }

  private async post(delivery: Delivery, attempt: number, generation: number): Promise<void> {
    const url = this.options.endpoint.url;
    if (!url) return;
    const { event } = delivery;
    let status: number | null = null;
    let error: string | null = null;
    try {
      await this.options.beforeDelivery?.();
    } catch (failure) {
      error = `not sent: ${failure instanceof Error ? failure.message : String(failure)}`;
    }
    if (generation !== this.generation) return;
    // The payload shows the event as it is at sending time, as the provider's deliveries do.
    const rawBody = JSON.stringify(event, null, 2);
    const timestamp = Math.floor(Date.now() / 1000);
    if (error === null) {
      try {
        const response = await fetch(url, {
          method: 'POST',
          headers: {
            'Content-Type': 'application/json; charset=utf-8',
            'User-Agent': WEBHOOK_USER_AGENT,
            [SIGNATURE_HEADER]: signatureHeaderValue(rawBody, this.options.endpoint.secret, timestamp),
          },
          body: rawBody,
          signal: AbortSignal.timeout(this.options.timeoutMs),
        });
        status = response.status;
        await response.arrayBuffer().catch(() => undefined);
      } catch (failure) {
        error = failure instanceof Error ? `${failure.name}: ${failure.message}` : String(failure);
      }
    }
    if (generation !== this.generation) return; // reset while the request was out
    this.attempts.push({
      eventId: event.id,
      type: event.type,
      attempt,
      copy: delivery.copy,
      status,
      error,
      at: new Date().toISOString(),
    });
    const received = status !== null && status >= 200 && status < 300;
    if (received) {
      if (delivery.copy === 'original' && !this.delivered.has(event.id)) {
        this.delivered.add(event.id);
        this.options.onDelivered(event.id);
      }
    } else {
      const retryDelay = this.options.retryDelaysMs[attempt - 1];
      if (retryDelay !== undefined) this.schedule(delivery, retryDelay, attempt + 1);
    }
    this.options.onAttempt?.();
  }

  history(): DeliveryAttempt[] {
    return this.attempts.map((attempt) => ({ ...attempt }));
  }

  /** Resolves once nothing is queued, waiting or on the wire (retries included). */
  idle(): Promise<void> {
    if (this.isIdle()) return Promise.resolve();
    return new Promise((resolve) => this.idleWaiters.push(resolve));
  }

  private isIdle(): boolean {
    return this.timers.pending === 0 && this.inFlight.size === 0 && this.reorderBatch.length === 0;
  }

  private settleIfIdle(): void {
    // Checked on the next turn, because a finished attempt may have just scheduled its retry.
    setImmediate(() => {
      if (!this.isIdle()) return;
      const waiters = this.idleWaiters;
      this.idleWaiters = [];
      for (const resolve of waiters) resolve();
    });
  }

  /** Drops everything queued or on the wire; the log stays (shutdown: the state file keeps it). */
  stop(): void {
    this.generation += 1;
    this.timers.clearAll();
    this.reorderBatch = [];
    this.settleIfIdle();
  }

  clear(): void {
    this.stop();
    this.attempts.length = 0;
    this.delivered.clear();
  }

  /** The log and the received set; the queue itself is not kept (the event log re-queues instead). */
  toSnapshot(): DispatcherSnapshot {
    return { attempts: this.history(), delivered: [...this.delivered] };
  }

  restoreSnapshot(snapshot: DispatcherSnapshot): void {
    this.clear();
    this.attempts.push(...snapshot.attempts.map((attempt) => ({ ...attempt })));
    for (const eventId of snapshot.delivered) this.delivered.add(eventId);
  }
}
