// The state file's document: our own versioned JSON, not any outside format.
//   { format: 'evenhand-payments-fake-state', version: 1, savedAt, platformAccountId, clock, ledger,
//     idempotency, faults, events, webhooks, accounts, accountLinks, onboardingSessions, transfers,
//     transferReversals, payouts, payoutAccounts, paymentIntents }
// Collections and maps are arrays in creation order, so lists read back in the same order.
// Each class turns its own part into plain data (toSnapshot) and back (restoreSnapshot); this
// module puts the parts together, and re-arms what ran on timers once the server is up.
// Reading an untrusted file is snapshot-reader.ts.

import type Stripe from 'stripe';
import type { ProviderEvent } from '../events/event-log';
import type { FaultSettings } from '../faults/fault-switches';
import type { IdempotencyRecord } from '../idempotency/idempotency-store';
import type { LedgerSnapshot } from '../ledger/ledger';
import { schedulePayoutSettlement } from '../resources/payouts';
import type { DispatcherSnapshot } from '../webhooks/webhook-dispatcher';
import type { AccountLinkRecord, OnboardingSessionRecord, ProviderWorld } from './provider-world';

export const STATE_FORMAT = 'evenhand-payments-fake-state';
export const STATE_VERSION = 1;

/** Everything the world holds, as plain data. */
export interface WorldState {
  platformAccountId: string;
  clock: { offsetMs: number };
  ledger: LedgerSnapshot;
  idempotency: IdempotencyRecord[];
  faults: FaultSettings;
  events: ProviderEvent[];
  webhooks: DispatcherSnapshot;
  accounts: Stripe.Account[];
  accountLinks: AccountLinkRecord[];
  onboardingSessions: OnboardingSessionRecord[];
  transfers: Stripe.Transfer[];
  /** Per transfer, its reversals in creation order. */
  transferReversals: Array<{ transferId: string; reversals: Stripe.TransferReversal[] }>;
  payouts: Stripe.Payout[];
  /** Per payout, the account whose balance pays it. */
  payoutAccounts: Array<{ payoutId: string; accountId: string }>;
  paymentIntents: Stripe.PaymentIntent[];
}

export interface WorldSnapshot extends WorldState {
  format: typeof STATE_FORMAT;
  version: typeof STATE_VERSION;
  /** ISO 8601, real time of writing. */
  savedAt: string;
}

/** The world's current state; holds live objects, so serialise it straight away. */
export function worldState(world: ProviderWorld): WorldState {
  return {
    platformAccountId: world.platformAccountId,
    clock: world.clock.toSnapshot(),
    ledger: world.ledger.toSnapshot(),
    idempotency: world.idempotency.toSnapshot(),
    faults: world.faults.toSnapshot(),
    events: world.events.toSnapshot(),
    webhooks: world.dispatcher.toSnapshot(),
    accounts: world.accounts.toSnapshot(),
    accountLinks: [...world.accountLinks.values()],
    onboardingSessions: [...world.onboardingSessions.values()],
    transfers: world.transfers.toSnapshot(),
    transferReversals: [...world.transferReversals].map(([transferId, reversals]) => ({ transferId, reversals })),
    payouts: world.payouts.toSnapshot(),
    payoutAccounts: [...world.payoutAccounts].map(([payoutId, accountId]) => ({ payoutId, accountId })),
    paymentIntents: world.paymentIntents.toSnapshot(),
  };
}

/** The file's text: the header first, so a reader sees format and version at the top. */
export function snapshotText(state: WorldState, savedAt: Date): string {
  return snapshotTextOf(JSON.stringify(state), savedAt);
}

/**
 * The same from `JSON.stringify(state)`, which the saver already has for its did-anything-change
 * check: one serialisation per write, and compact, because the whole world is written before each
 * acknowledgement (format it with `jq .` to read it).
 */
export function snapshotTextOf(compactState: string, savedAt: Date): string {
  const header = JSON.stringify({ format: STATE_FORMAT, version: STATE_VERSION, savedAt: savedAt.toISOString() });
  return compactState === '{}' ? `${header}\n` : `${header.slice(0, -1)},${compactState.slice(1)}\n`;
}

/** Replaces the world's content with a saved state. Arms no timers: see resumeWorld. */
export function restoreWorld(world: ProviderWorld, state: WorldState): void {
  world.timers.clearAll();
  world.restorePlatformAccountId(state.platformAccountId);
  world.clock.restoreSnapshot(state.clock);
  world.ledger.restoreSnapshot(state.ledger);
  world.idempotency.restoreSnapshot(state.idempotency);
  world.faults.restoreSnapshot(state.faults);
  world.dispatcher.restoreSnapshot(state.webhooks);
  world.events.restoreSnapshot(state.events);
  world.accounts.restoreSnapshot(state.accounts);
  world.accountLinks.clear();
  for (const link of state.accountLinks) world.accountLinks.set(link.token, link);
  world.onboardingSessions.clear();
  for (const session of state.onboardingSessions) world.onboardingSessions.set(session.id, session);
  world.transfers.restoreSnapshot(state.transfers);
  world.transferReversals.clear();
  for (const { transferId, reversals } of state.transferReversals) world.transferReversals.set(transferId, reversals);
  world.payouts.restoreSnapshot(state.payouts);
  world.payoutAccounts.clear();
  for (const { payoutId, accountId } of state.payoutAccounts) world.payoutAccounts.set(payoutId, accountId);
  world.paymentIntents.restoreSnapshot(state.paymentIntents);
}

/**
 * Starts again what a restored world had waiting on timers: pending funds are released at their
 * saved time (at once when it has passed), pending payouts are paid payoutSettleMs after their
 * `created` on the stand-in's clock (at once when that has passed, also when the clock was moved
 * past it), and events not yet received by the webhook endpoint are queued again, oldest first,
 * from the first attempt. Re-queued rather than dropped: the provider keeps retrying undelivered
 * events for days (from memory: up to three days, https://docs.stripe.com/webhooks#retries), and
 * the api's database only learns of a change through its event. A receiver may therefore see an
 * event twice, which the provider's own deliveries allow too.
 */
export function resumeWorld(world: ProviderWorld): void {
  world.scheduleFundsRelease();
  for (const payout of world.payouts.toSnapshot()) {
    if (payout.status !== 'pending') continue;
    const dueMs = payout.created * 1000 + world.options.payoutSettleMs;
    schedulePayoutSettlement(world, payout.id, dueMs - world.clock.nowMs());
  }
  world.events.requeueUndelivered();
}
