// Payouts from an available balance to the account's bank account. Shape from
// https://docs.stripe.com/api/payouts/object (SDK type `Stripe.Payout`); a payout is made by the
// platform, or by a connected account when the request carries its Stripe-Account header.
// Status goes pending → paid (payout.paid), or pending → canceled (payout.canceled), or
// pending → failed (payout.failed, only through the control route) with the money returned.

import type Stripe from 'stripe';
import type { ProviderCall, ProviderRoute } from '../app/provider-route';
import { applyMetadataChange } from '../encoding/param-reader';
import { providerErrors } from '../errors/provider-error';
import type { EventRequest } from '../events/event-log';
import { previousAttributes } from '../events/previous-attributes';
import { objectId } from '../ids/object-id';
import { listPage, readListQuery } from '../lists/list-page';
import type { ProviderWorld } from '../state/provider-world';
import { expandObject } from './expand';

export const PAYOUT_STATUSES = ['pending', 'paid', 'failed', 'canceled', 'in_transit'] as const;
const PLATFORM_BANK_ACCOUNT = 'ba_platform_test_bank';
const DAY_SECONDS = 24 * 60 * 60;

function bankAccountOf(world: ProviderWorld, accountId: string): string | null {
  if (accountId === world.platformAccountId) return PLATFORM_BANK_ACCOUNT;
  return world.accounts.get(accountId)?.external_accounts?.data[0]?.id ?? null;
}

function requirePayout(world: ProviderWorld, call: ProviderCall, id: string): Stripe.Payout {
  const payout = world.payouts.get(id);
  if (!payout || world.payoutAccounts.get(id) !== call.account.id) throw providerErrors.resourceMissing('payout', id);
  return payout;
}

function eventAccount(world: ProviderWorld, payoutId: string): string | undefined {
  const accountId = world.payoutAccounts.get(payoutId);
  return accountId === world.platformAccountId ? undefined : accountId;
}

function changeStatus(
  world: ProviderWorld,
  payout: Stripe.Payout,
  type: string,
  change: (payout: Stripe.Payout) => void,
  request?: EventRequest,
): void {
  const before = structuredClone(payout);
  change(payout);
  world.emit({
    type,
    object: payout,
    previousAttributes: previousAttributes(before, payout),
    account: eventAccount(world, payout.id),
    request,
  });
}

export function settlePayout(world: ProviderWorld, payoutId: string): boolean {
  const payout = world.payouts.get(payoutId);
  if (!payout || payout.status !== 'pending') return false;
  changeStatus(world, payout, 'payout.paid', (target) => {
    target.status = 'paid';
  });
  return true;
}

/** Pays a pending payout after `delayMs` of real time (unless it was canceled or failed meanwhile). */
export function schedulePayoutSettlement(world: ProviderWorld, payoutId: string, delayMs: number): void {
  world.timers.after(Math.max(0, delayMs), () => settlePayout(world, payoutId));
}

/** Fails a pending payout and returns its amount to the balance it came from. */
export function failPayout(world: ProviderWorld, payoutId: string, failureCode: string): Stripe.Payout | undefined {
  const payout = world.payouts.get(payoutId);
  const accountId = world.payoutAccounts.get(payoutId);
  if (!payout || !accountId || payout.status !== 'pending') return undefined;
  world.ledger.creditAvailable(accountId, payout.currency, payout.amount);
  changeStatus(world, payout, 'payout.failed', (target) => {
    target.status = 'failed';
    target.failure_code = failureCode;
    target.failure_message = `The payout could not be completed (${failureCode}).`;
    target.failure_balance_transaction = objectId('txn');
  });
  return payout;
}

function createPayout(call: ProviderCall, world: ProviderWorld): Stripe.Payout {
  const { params } = call;
  const amount = params.integer('amount', { required: true, min: 1 }) as number;
  const currency = params.currency('currency', { required: true }) as string;
  const description = params.string('description', { maxLength: 5000 }) ?? null;
  const metadata = applyMetadataChange({}, params.metadata());
  const method = params.oneOf('method', ['standard', 'instant'] as const) ?? 'standard';
  const statementDescriptor = params.string('statement_descriptor', { maxLength: 22 }) ?? null;
  const requestedDestination = params.string('destination');
  params.oneOf('source_type', ['bank_account', 'card', 'fpx'] as const);
  const expand = params.stringList('expand');
  params.finish();

  const accountId = call.account.id;
  if (!call.account.isPlatform && !world.accounts.get(accountId)?.payouts_enabled) {
    throw providerErrors.payoutsNotAllowed(accountId);
  }
  const bankAccount = bankAccountOf(world, accountId);
  if (requestedDestination !== undefined && requestedDestination !== bankAccount) {
    throw providerErrors.referenceMissing('external account', requestedDestination, 'destination');
  }
  world.ledger.debitAvailable(accountId, currency, amount);

  const created = world.clock.nowSeconds();
  const payout: Stripe.Payout = {
    id: objectId('po'),
    object: 'payout',
    amount,
    application_fee: null,
    application_fee_amount: null,
    arrival_date: method === 'instant' ? created : created + DAY_SECONDS,
    automatic: false,
    balance_transaction: objectId('txn'),
    created,
    currency,
    description,
    destination: bankAccount,
    failure_balance_transaction: null,
    failure_code: null,
    failure_message: null,
    livemode: false,
    metadata,
    method,
    original_payout: null,
    payout_method: null,
    reconciliation_status: 'not_applicable',
    reversed_by: null,
    source_type: 'card',
    statement_descriptor: statementDescriptor,
    status: 'pending',
    trace_id: null,
    type: 'bank_account',
  };
  world.payouts.add(payout);
  world.payoutAccounts.set(payout.id, accountId);
  world.emit({
    type: 'payout.created',
    object: payout,
    account: eventAccount(world, payout.id),
    request: { id: call.request.id, idempotencyKey: call.request.idempotencyKey },
  });
  schedulePayoutSettlement(world, payout.id, world.options.payoutSettleMs);
  return expandObject(structuredClone(payout), expand, {});
}

export const payoutRoutes: ProviderRoute[] = [
  { method: 'post', path: '/v1/payouts', handle: createPayout },
  {
    method: 'get',
    path: '/v1/payouts',
    handle: (call, world) => {
      const { params } = call;
      const query = readListQuery(params);
      const status = params.oneOf('status', PAYOUT_STATUSES);
      params.stringList('expand');
      params.finish();
      const matching = world.payouts.newestFirst(
        (payout) =>
          world.payoutAccounts.get(payout.id) === call.account.id && (status === undefined || payout.status === status),
      );
      return structuredClone(listPage(matching, query, '/v1/payouts', 'payout'));
    },
  },
  {
    method: 'get',
    path: '/v1/payouts/:id',
    handle: (call, world) => {
      const payout = requirePayout(world, call, call.pathParams.id as string);
      const expand = call.params.stringList('expand');
      call.params.finish();
      return expandObject(structuredClone(payout), expand, {});
    },
  },
  {
    method: 'post',
    path: '/v1/payouts/:id/cancel',
    handle: (call, world) => {
      const payout = requirePayout(world, call, call.pathParams.id as string);
      const expand = call.params.stringList('expand');
      call.params.finish();
      if (payout.status !== 'pending') {
        throw providerErrors.unexpectedState(
          `Payout ${payout.id} is ${payout.status} and can no longer be canceled.`,
          'payout_not_cancelable',
        );
      }
      world.ledger.creditAvailable(call.account.id, payout.currency, payout.amount);
      changeStatus(
        world,
        payout,
        'payout.canceled',
        (target) => {
          target.status = 'canceled';
        },
        { id: call.request.id, idempotencyKey: call.request.idempotencyKey },
      );
      return expandObject(structuredClone(payout), expand, {});
    },
  },
];
