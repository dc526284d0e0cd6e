// Switches that make the stand-in misbehave on purpose, so callers can test their retries:
// slow answers, 500/429 errors, connections closed before or after the work is done, and
// duplicated, delayed or reordered webhooks. Pure: no framework imports.

import {
  asObject,
  ControlInputError,
  readBoolean,
  readInteger,
  refuseUnknownFields,
  type JsonObject,
} from '../control/control-input';

export type FailStatus = 500 | 429;

export interface WebhookFaults {
  duplicate: boolean;
  delayMs: number;
  reorder: boolean;
}

export interface FaultSettings {
  latencyMs: number;
  failNext: { status: FailStatus; count: number } | null;
  dropConnectionNext: number;
  dropResponseNext: number;
  webhook: WebhookFaults;
}

export type RequestFault = { kind: 'drop_connection' } | { kind: 'fail'; status: FailStatus };

const MAX_DELAY_MS = 120_000;

function noFaults(): FaultSettings {
  return {
    latencyMs: 0,
    failNext: null,
    dropConnectionNext: 0,
    dropResponseNext: 0,
    webhook: { duplicate: false, delayMs: 0, reorder: false },
  };
}

/** Validates a POST /_control/faults body; fields left out keep their current setting. */
export function readFaultChange(
  input: unknown,
): Partial<Omit<FaultSettings, 'webhook'>> & { webhook?: Partial<WebhookFaults> } {
  const body = asObject(input, 'body');
  refuseUnknownFields(body, ['latencyMs', 'failNext', 'dropConnectionNext', 'dropResponseNext', 'webhook']);
  const change: ReturnType<typeof readFaultChange> = {};
  const latencyMs = readInteger(body, 'latencyMs', { min: 0, max: MAX_DELAY_MS });
  if (latencyMs !== undefined) change.latencyMs = latencyMs;
  if (body.failNext !== undefined) {
    const failNext = asObject(body.failNext, 'failNext');
    refuseUnknownFields(failNext, ['status', 'count'], 'failNext.');
    const status = readInteger(failNext, 'status', { required: true, label: 'failNext.status' });
    if (status !== 500 && status !== 429) throw new ControlInputError('failNext.status', 'must be 500 or 429');
    const count = readInteger(failNext, 'count', { min: 0, max: 1000, label: 'failNext.count' }) ?? 1;
    change.failNext = { status, count };
  }
  const dropConnectionNext = readInteger(body, 'dropConnectionNext', { min: 0, max: 1000 });
  if (dropConnectionNext !== undefined) change.dropConnectionNext = dropConnectionNext;
  const dropResponseNext = readInteger(body, 'dropResponseNext', { min: 0, max: 1000 });
  if (dropResponseNext !== undefined) change.dropResponseNext = dropResponseNext;
  if (body.webhook !== undefined) {
    const webhook: JsonObject = asObject(body.webhook, 'webhook');
    refuseUnknownFields(webhook, ['duplicate', 'delayMs', 'reorder'], 'webhook.');
    change.webhook = {};
    const duplicate = readBoolean(webhook, 'duplicate', 'webhook.duplicate');
    if (duplicate !== undefined) change.webhook.duplicate = duplicate;
    const delayMs = readInteger(webhook, 'delayMs', { min: 0, max: MAX_DELAY_MS, label: 'webhook.delayMs' });
    if (delayMs !== undefined) change.webhook.delayMs = delayMs;
    const reorder = readBoolean(webhook, 'reorder', 'webhook.reorder');
    if (reorder !== undefined) change.webhook.reorder = reorder;
  }
  return change;
}

export class FaultSwitches {
  private current: FaultSettings = noFaults();

  settings(): FaultSettings {
    return structuredClone(this.current);
  }

  apply(change: ReturnType<typeof readFaultChange>): FaultSettings {
    const { webhook, ...rest } = change;
    this.current = { ...this.current, ...rest, webhook: { ...this.current.webhook, ...webhook } };
    if (this.current.failNext?.count === 0) this.current.failNext = null;
    return this.settings();
  }

  clear(): void {
    this.current = noFaults();
  }

  toSnapshot(): FaultSettings {
    return this.settings();
  }

  restoreSnapshot(settings: FaultSettings): void {
    this.current = structuredClone(settings);
  }

  get latencyMs(): number {
    return this.current.latencyMs;
  }

  get webhook(): WebhookFaults {
    return { ...this.current.webhook };
  }

  /** The fault, if any, for the next API request; each use counts down its switch. */
  takeRequestFault(): RequestFault | undefined {
    if (this.current.dropConnectionNext > 0) {
      this.current.dropConnectionNext -= 1;
      return { kind: 'drop_connection' };
    }
    const failNext = this.current.failNext;
    if (failNext && failNext.count > 0) {
      failNext.count -= 1;
      if (failNext.count === 0) this.current.failNext = null;
      return { kind: 'fail', status: failNext.status };
    }
    return undefined;
  }

  /** Whether to close the connection instead of sending the answer of a request that did its work. */
  takeResponseDrop(): boolean {
    if (this.current.dropResponseNext > 0) {
      this.current.dropResponseNext -= 1;
      return true;
    }
    return false;
  }
}
