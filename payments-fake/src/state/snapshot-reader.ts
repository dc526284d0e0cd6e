// Reads a parsed state file back into a WorldSnapshot, checking it on the way: a file of another
// format or version, or one whose content has the wrong shape, is refused with the path of the
// first bad field (`ledger.pending[2].amount: must be an integer`). Provider objects are checked
// for what the stand-in relies on (id, object, and the fields its timers read); the rest is kept
// as written. Pure: no framework imports.

import type Stripe from 'stripe';
import type { ProviderEvent } from '../events/event-log';
import type { FaultSettings } from '../faults/fault-switches';
import type { IdempotencyRecord } from '../idempotency/idempotency-store';
import type { LedgerSnapshot } from '../ledger/ledger';
import type { DeliveryAttempt, DispatcherSnapshot } from '../webhooks/webhook-dispatcher';
import type { AccountLinkRecord, OnboardingSessionRecord } from './provider-world';
import { STATE_FORMAT, STATE_VERSION, type WorldSnapshot } from './world-snapshot';

export class SnapshotError extends Error {
  constructor(
    readonly field: string,
    problem: string,
  ) {
    super(field === '' ? problem : `${field}: ${problem}`);
    this.name = 'SnapshotError';
  }
}

type JsonObject = Record<string, unknown>;

function describe(value: unknown): string {
  if (value === undefined) return 'nothing';
  if (value === null) return 'null';
  if (Array.isArray(value)) return 'an array';
  if (typeof value === 'string') return `'${value.length > 40 ? `${value.slice(0, 40)}…` : value}'`;
  if (typeof value === 'number' || typeof value === 'boolean') return String(value);
  return 'an object';
}

function object(value: unknown, field: string): JsonObject {
  if (value === null || typeof value !== 'object' || Array.isArray(value)) {
    throw new SnapshotError(field, `must be an object, found ${describe(value)}`);
  }
  return value as JsonObject;
}

function array(value: unknown, field: string): unknown[] {
  if (!Array.isArray(value)) throw new SnapshotError(field, `must be an array, found ${describe(value)}`);
  return value;
}

function string(value: unknown, field: string, pattern?: RegExp, patternText?: string): string {
  if (typeof value !== 'string') throw new SnapshotError(field, `must be a string, found ${describe(value)}`);
  if (pattern && !pattern.test(value))
    throw new SnapshotError(field, `must be ${patternText ?? String(pattern)}, found ${describe(value)}`);
  return value;
}

function nullableString(value: unknown, field: string): string | null {
  return value === null ? null : string(value, field);
}

function integer(value: unknown, field: string, min = Number.MIN_SAFE_INTEGER, max = Number.MAX_SAFE_INTEGER): number {
  if (typeof value !== 'number' || !Number.isSafeInteger(value))
    throw new SnapshotError(field, `must be an integer, found ${describe(value)}`);
  if (value < min || value > max) throw new SnapshotError(field, `must be between ${min} and ${max}, found ${value}`);
  return value;
}

function boolean(value: unknown, field: string): boolean {
  if (typeof value !== 'boolean') throw new SnapshotError(field, `must be true or false, found ${describe(value)}`);
  return value;
}

function oneOf<T extends string | number>(value: unknown, field: string, allowed: readonly T[]): T {
  if (!allowed.includes(value as T))
    throw new SnapshotError(field, `must be one of ${allowed.join(', ')}, found ${describe(value)}`);
  return value as T;
}

/** Each element checked by `read`, with its index in the field name. */
function list<T>(value: unknown, field: string, read: (item: unknown, field: string) => T): T[] {
  return array(value, field).map((item, index) => read(item, `${field}[${index}]`));
}

function uniqueBy<T>(items: readonly T[], field: string, keyOf: (item: T) => string): T[] {
  const seen = new Set<string>();
  items.forEach((item, index) => {
    const key = keyOf(item);
    if (seen.has(key)) throw new SnapshotError(`${field}[${index}]`, `repeats ${key}`);
    seen.add(key);
  });
  return [...items];
}

const CURRENCY = /^[a-z]{3}$/;

/** A provider object: an object with an id of the right prefix and the right `object` name. */
function providerObject<T>(
  objectName: string,
  idPrefix: string,
  readMore?: (value: JsonObject, field: string) => void,
) {
  return (value: unknown, field: string): T => {
    const item = object(value, field);
    string(item.id, `${field}.id`, new RegExp(`^${idPrefix}_[A-Za-z0-9_]+$`), `an id starting ${idPrefix}_`);
    oneOf(item.object, `${field}.object`, [objectName]);
    readMore?.(item, field);
    return item as T;
  };
}

const readAccount = providerObject<Stripe.Account>('account', 'acct');
const readTransfer = providerObject<Stripe.Transfer>('transfer', 'tr', (item, field) => {
  integer(item.amount, `${field}.amount`, 0);
  integer(item.amount_reversed, `${field}.amount_reversed`, 0);
  string(item.currency, `${field}.currency`, CURRENCY, 'a lower-case currency code');
});
const readReversal = providerObject<Stripe.TransferReversal>('transfer_reversal', 'trr');
const readPayout = providerObject<Stripe.Payout>('payout', 'po', (item, field) => {
  integer(item.amount, `${field}.amount`, 0);
  integer(item.created, `${field}.created`, 0);
  string(item.currency, `${field}.currency`, CURRENCY, 'a lower-case currency code');
  string(item.status, `${field}.status`);
});
const readPaymentIntent = providerObject<Stripe.PaymentIntent>('payment_intent', 'pi', (item, field) => {
  string(item.status, `${field}.status`);
});

function readLedger(value: unknown, field: string): LedgerSnapshot {
  const ledger = object(value, field);
  const available = list(ledger.available, `${field}.available`, (item, at) => {
    const entry = object(item, at);
    return {
      accountId: string(entry.accountId, `${at}.accountId`),
      currency: string(entry.currency, `${at}.currency`, CURRENCY, 'a lower-case currency code'),
      amount: integer(entry.amount, `${at}.amount`),
    };
  });
  uniqueBy(available, `${field}.available`, (entry) => `${entry.accountId} ${entry.currency}`);
  const pending = list(ledger.pending, `${field}.pending`, (item, at) => {
    const entry = object(item, at);
    return {
      accountId: string(entry.accountId, `${at}.accountId`),
      currency: string(entry.currency, `${at}.currency`, CURRENCY, 'a lower-case currency code'),
      amount: integer(entry.amount, `${at}.amount`),
      availableOnMs: integer(entry.availableOnMs, `${at}.availableOnMs`),
    };
  });
  return { available, pending };
}

function readIdempotencyRecord(value: unknown, field: string): IdempotencyRecord {
  const record = object(value, field);
  const response = object(record.response, `${field}.response`);
  return {
    scope: string(record.scope, `${field}.scope`),
    key: string(record.key, `${field}.key`),
    endpoint: string(record.endpoint, `${field}.endpoint`),
    fingerprint: string(record.fingerprint, `${field}.fingerprint`),
    requestId: string(record.requestId, `${field}.requestId`),
    createdAtMs: integer(record.createdAtMs, `${field}.createdAtMs`),
    response: {
      status: integer(response.status, `${field}.response.status`, 100, 599),
      body: string(response.body, `${field}.response.body`),
    },
  };
}

function readFaults(value: unknown, field: string): FaultSettings {
  const faults = object(value, field);
  const webhook = object(faults.webhook, `${field}.webhook`);
  let failNext: FaultSettings['failNext'] = null;
  if (faults.failNext !== null) {
    const fail = object(faults.failNext, `${field}.failNext`);
    failNext = {
      status: oneOf(fail.status, `${field}.failNext.status`, [500, 429] as const),
      count: integer(fail.count, `${field}.failNext.count`, 0),
    };
  }
  return {
    latencyMs: integer(faults.latencyMs, `${field}.latencyMs`, 0),
    failNext,
    dropConnectionNext: integer(faults.dropConnectionNext, `${field}.dropConnectionNext`, 0),
    dropResponseNext: integer(faults.dropResponseNext, `${field}.dropResponseNext`, 0),
    webhook: {
      duplicate: boolean(webhook.duplicate, `${field}.webhook.duplicate`),
      delayMs: integer(webhook.delayMs, `${field}.webhook.delayMs`, 0),
      reorder: boolean(webhook.reorder, `${field}.webhook.reorder`),
    },
  };
}

function readEvent(value: unknown, field: string): ProviderEvent {
  const event = providerObject<ProviderEvent>('event', 'evt')(value, field);
  const raw = event as unknown as JsonObject;
  string(raw.type, `${field}.type`);
  integer(raw.created, `${field}.created`, 0);
  integer(raw.pending_webhooks, `${field}.pending_webhooks`, 0);
  object(raw.data, `${field}.data`);
  object(raw.request, `${field}.request`);
  if (raw.account !== undefined) string(raw.account, `${field}.account`);
  return event;
}

function readWebhooks(value: unknown, field: string): DispatcherSnapshot {
  const webhooks = object(value, field);
  const attempts = list(webhooks.attempts, `${field}.attempts`, (item, at): DeliveryAttempt => {
    const attempt = object(item, at);
    return {
      eventId: string(attempt.eventId, `${at}.eventId`),
      type: string(attempt.type, `${at}.type`),
      attempt: integer(attempt.attempt, `${at}.attempt`, 1),
      copy: oneOf(attempt.copy, `${at}.copy`, ['original', 'duplicate'] as const),
      status: attempt.status === null ? null : integer(attempt.status, `${at}.status`, 100, 599),
      error: nullableString(attempt.error, `${at}.error`),
      at: string(attempt.at, `${at}.at`),
    };
  });
  const delivered = list(webhooks.delivered, `${field}.delivered`, (item, at) => string(item, at));
  return { attempts, delivered };
}

function readAccountLink(value: unknown, field: string): AccountLinkRecord {
  const link = object(value, field);
  return {
    token: string(link.token, `${field}.token`),
    accountId: string(link.accountId, `${field}.accountId`),
    type: oneOf(link.type, `${field}.type`, ['account_onboarding', 'account_update'] as const),
    refreshUrl: string(link.refreshUrl, `${field}.refreshUrl`),
    returnUrl: string(link.returnUrl, `${field}.returnUrl`),
    createdAt: integer(link.createdAt, `${field}.createdAt`, 0),
    expiresAt: integer(link.expiresAt, `${field}.expiresAt`, 0),
    used: boolean(link.used, `${field}.used`),
  };
}

function readOnboardingSession(value: unknown, field: string): OnboardingSessionRecord {
  const session = object(value, field);
  return {
    id: string(session.id, `${field}.id`),
    linkToken: string(session.linkToken, `${field}.linkToken`),
    accountId: string(session.accountId, `${field}.accountId`),
    refreshUrl: string(session.refreshUrl, `${field}.refreshUrl`),
    returnUrl: string(session.returnUrl, `${field}.returnUrl`),
    expiresAt: integer(session.expiresAt, `${field}.expiresAt`, 0),
    finished: boolean(session.finished, `${field}.finished`),
  };
}

const FIELDS = [
  'format',
  'version',
  'savedAt',
  'platformAccountId',
  'clock',
  'ledger',
  'idempotency',
  'faults',
  'events',
  'webhooks',
  'accounts',
  'accountLinks',
  'onboardingSessions',
  'transfers',
  'transferReversals',
  'payouts',
  'payoutAccounts',
  'paymentIntents',
] as const satisfies readonly (keyof WorldSnapshot)[];
// Fails to compile when WorldSnapshot gains a field that FIELDS (and so this reader) lacks.
const _everyFieldRead: Exclude<keyof WorldSnapshot, (typeof FIELDS)[number]> extends never ? true : never = true;

/** The snapshot in `value` (already parsed from JSON), or a SnapshotError naming what is wrong. */
export function readWorldSnapshot(value: unknown): WorldSnapshot {
  const root = object(value, '(top level)');
  if (root.format !== STATE_FORMAT) {
    throw new SnapshotError(
      'format',
      `must be '${STATE_FORMAT}' (this is not a payments-fake state file), found ${describe(root.format)}`,
    );
  }
  if (root.version !== STATE_VERSION) {
    throw new SnapshotError(
      'version',
      `must be ${STATE_VERSION} (the only version this stand-in reads), found ${describe(root.version)}`,
    );
  }
  for (const key of Object.keys(root)) {
    if (!(FIELDS as readonly string[]).includes(key))
      throw new SnapshotError(key, `is not a field of version ${STATE_VERSION}`);
  }
  const savedAt = string(root.savedAt, 'savedAt');
  if (Number.isNaN(Date.parse(savedAt)))
    throw new SnapshotError('savedAt', `must be an ISO 8601 time, found '${savedAt}'`);
  const clock = object(root.clock, 'clock');

  const accounts = uniqueBy(list(root.accounts, 'accounts', readAccount), 'accounts', (account) => account.id);
  const payouts = uniqueBy(list(root.payouts, 'payouts', readPayout), 'payouts', (payout) => payout.id);
  const transfers = uniqueBy(list(root.transfers, 'transfers', readTransfer), 'transfers', (transfer) => transfer.id);
  const transferIds = new Set(transfers.map((transfer) => transfer.id));
  const payoutIds = new Set(payouts.map((payout) => payout.id));

  const transferReversals = list(root.transferReversals, 'transferReversals', (item, at) => {
    const entry = object(item, at);
    const transferId = string(entry.transferId, `${at}.transferId`);
    if (!transferIds.has(transferId))
      throw new SnapshotError(`${at}.transferId`, `names no transfer in transfers (${transferId})`);
    return { transferId, reversals: list(entry.reversals, `${at}.reversals`, readReversal) };
  });
  uniqueBy(transferReversals, 'transferReversals', (entry) => entry.transferId);
  const payoutAccounts = list(root.payoutAccounts, 'payoutAccounts', (item, at) => {
    const entry = object(item, at);
    const payoutId = string(entry.payoutId, `${at}.payoutId`);
    if (!payoutIds.has(payoutId)) throw new SnapshotError(`${at}.payoutId`, `names no payout in payouts (${payoutId})`);
    return { payoutId, accountId: string(entry.accountId, `${at}.accountId`) };
  });
  uniqueBy(payoutAccounts, 'payoutAccounts', (entry) => entry.payoutId);
  const paidFrom = new Set(payoutAccounts.map((entry) => entry.payoutId));
  const missingAccount = payouts.find((payout) => !paidFrom.has(payout.id));
  if (missingAccount) throw new SnapshotError('payoutAccounts', `has no entry for payout ${missingAccount.id}`);

  return {
    format: STATE_FORMAT,
    version: STATE_VERSION,
    savedAt,
    platformAccountId: string(
      root.platformAccountId,
      'platformAccountId',
      /^acct_[A-Za-z0-9]+$/,
      'an account id (acct_…)',
    ),
    clock: { offsetMs: integer(clock.offsetMs, 'clock.offsetMs') },
    ledger: readLedger(root.ledger, 'ledger'),
    idempotency: uniqueBy(
      list(root.idempotency, 'idempotency', readIdempotencyRecord),
      'idempotency',
      (record) => `${record.scope} ${record.key}`,
    ),
    faults: readFaults(root.faults, 'faults'),
    events: uniqueBy(list(root.events, 'events', readEvent), 'events', (event) => event.id),
    webhooks: readWebhooks(root.webhooks, 'webhooks'),
    accounts,
    accountLinks: uniqueBy(
      list(root.accountLinks, 'accountLinks', readAccountLink),
      'accountLinks',
      (link) => link.token,
    ),
    onboardingSessions: uniqueBy(
      list(root.onboardingSessions, 'onboardingSessions', readOnboardingSession),
      'onboardingSessions',
      (session) => session.id,
    ),
    transfers,
    transferReversals,
    payouts,
    payoutAccounts,
    paymentIntents: uniqueBy(
      list(root.paymentIntents, 'paymentIntents', readPaymentIntent),
      'paymentIntents',
      (intent) => intent.id,
    ),
  };
}
