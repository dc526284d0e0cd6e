// Event objects as the provider publishes them (https://docs.stripe.com/api/events/object):
// id `evt_…`, `type`, `data.object` (a snapshot of the object when the event happened),
// `data.previous_attributes` on updates, `account` for events of a connected account,
// `request` {id, idempotency_key}, `pending_webhooks`. Kept newest first for GET /v1/events.

import type { Clock } from '../clock/clock';
import { objectId } from '../ids/object-id';

export interface ProviderEvent {
  id: string;
  object: 'event';
  account?: string;
  api_version: string;
  created: number;
  data: { object: unknown; previous_attributes?: Record<string, unknown> };
  livemode: false;
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null };
  type: string;
}

export interface EventRequest {
  id: string | null;
  idempotencyKey: string | null;
}

export interface NewEvent {
  type: string;
  object: unknown;
  previousAttributes?: Record<string, unknown>;
  /** The connected account the event belongs to; absent for the platform's own events. */
  account?: string;
  request?: EventRequest;
}

export class EventLog {
  private events: ProviderEvent[] = [];
  private readonly byId = new Map<string, ProviderEvent>();

  constructor(
    private readonly clock: Clock,
    private readonly apiVersion: string,
    private readonly deliver: (event: ProviderEvent) => number,
  ) {}

  emit(input: NewEvent): ProviderEvent {
    const event: ProviderEvent = {
      id: objectId('evt'),
      object: 'event',
      ...(input.account ? { account: input.account } : {}),
      api_version: this.apiVersion,
      created: this.clock.nowSeconds(),
      data: {
        object: structuredClone(input.object),
        ...(input.previousAttributes ? { previous_attributes: structuredClone(input.previousAttributes) } : {}),
      },
      livemode: false,
      pending_webhooks: 0,
      request: { id: input.request?.id ?? null, idempotency_key: input.request?.idempotencyKey ?? null },
      type: input.type,
    };
    this.events.push(event);
    this.byId.set(event.id, event);
    event.pending_webhooks = this.deliver(event);
    return event;
  }

  get(id: string): ProviderEvent | undefined {
    return this.byId.get(id);
  }

  /** Events of one account (undefined: the platform's own), newest first. */
  newestFirst(account: string | undefined): ProviderEvent[] {
    return this.events.filter((event) => event.account === account).reverse();
  }

  markDelivered(id: string): void {
    const event = this.byId.get(id);
    if (event && event.pending_webhooks > 0) event.pending_webhooks -= 1;
  }

  clear(): void {
    this.events = [];
    this.byId.clear();
  }

  /**
   * Every event in creation order, `pending_webhooks` telling whether it still awaits delivery.
   * The live objects, to be serialised at once, not changed.
   */
  toSnapshot(): ProviderEvent[] {
    return [...this.events];
  }

  /** Takes over events read back from the state file; nothing is delivered (see `requeueUndelivered`). */
  restoreSnapshot(events: readonly ProviderEvent[]): void {
    this.clear();
    for (const event of events) {
      if (this.byId.has(event.id)) throw new RangeError(`${event.id} appears twice`);
      this.events.push(event);
      this.byId.set(event.id, event);
    }
  }

  /** Hands events still awaiting delivery to the dispatcher again, oldest first; returns how many. */
  requeueUndelivered(): number {
    const undelivered = this.events.filter((event) => event.pending_webhooks > 0);
    for (const event of undelivered) this.deliver(event);
    return undelivered.length;
  }
}
