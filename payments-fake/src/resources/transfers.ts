// Transfers from the platform balance to a connected account, and their reversals.
// Shapes from https://docs.stripe.com/api/transfers/object and
// https://docs.stripe.com/api/transfer_reversals/object (SDK types `Stripe.Transfer`,
// `Stripe.TransferReversal`). A transfer needs enough available platform balance
// (`balance_insufficient`, https://docs.stripe.com/error-codes#balance-insufficient) and a
// destination whose transfers capability is active
// (https://docs.stripe.com/error-codes#insufficient-capabilities-for-transfer).

import type Stripe from 'stripe';
import type { ProviderCall, ProviderRoute } from '../app/provider-route';
import { applyMetadataChange } from '../encoding/param-reader';
import { providerErrors } from '../errors/provider-error';
import { previousAttributes } from '../events/previous-attributes';
import { objectId } from '../ids/object-id';
import { listPage, readListQuery } from '../lists/list-page';
import type { ProviderWorld } from '../state/provider-world';
import { requirePlatform } from './acting-account';
import { expandListData, expandObject, type Expanders } from './expand';

const EMBEDDED_REVERSALS = 10;

function expanders(world: ProviderWorld): Expanders {
  return {
    destination: (id) => {
      const account = world.accounts.get(id);
      return account ? structuredClone(account) : undefined;
    },
  };
}

function requireTransfer(world: ProviderWorld, id: string, param = 'id'): Stripe.Transfer {
  const transfer = world.transfers.get(id);
  if (!transfer) throw providerErrors.resourceMissing('transfer', id, param);
  return transfer;
}

function eventRequest(call: ProviderCall) {
  return { id: call.request.id, idempotencyKey: call.request.idempotencyKey };
}

function reversalsNewestFirst(world: ProviderWorld, transferId: string): Stripe.TransferReversal[] {
  return [...(world.transferReversals.get(transferId) ?? [])].reverse();
}

function embeddedReversals(world: ProviderWorld, transferId: string): Stripe.ApiList<Stripe.TransferReversal> {
  const all = reversalsNewestFirst(world, transferId);
  return {
    object: 'list',
    data: all.slice(0, EMBEDDED_REVERSALS),
    has_more: all.length > EMBEDDED_REVERSALS,
    url: `/v1/transfers/${transferId}/reversals`,
  };
}

function createTransfer(call: ProviderCall, world: ProviderWorld): Stripe.Transfer {
  requirePlatform(call);
  const { params } = call;
  const amount = params.integer('amount', { required: true, min: 1 }) as number;
  const currency = params.currency('currency', { required: true }) as string;
  const destinationId = params.string('destination', { required: true }) as string;
  const transferGroup = params.string('transfer_group', { maxLength: 5000 }) ?? null;
  const description = params.string('description', { maxLength: 5000 }) ?? null;
  const metadata = applyMetadataChange({}, params.metadata());
  const sourceType = params.oneOf('source_type', ['bank_account', 'card', 'fpx'] as const) ?? 'card';
  const expand = params.stringList('expand');
  params.finish();

  const destination = world.accounts.get(destinationId);
  if (!destination) throw providerErrors.referenceMissing('destination', destinationId, 'destination');
  if (destination.capabilities?.transfers !== 'active') {
    throw providerErrors.insufficientCapabilitiesForTransfer(destinationId);
  }
  world.ledger.debitAvailable(world.platformAccountId, currency, amount);
  world.ledger.creditAvailable(destination.id, currency, amount);

  const id = objectId('tr');
  const transfer: Stripe.Transfer = {
    id,
    object: 'transfer',
    amount,
    amount_reversed: 0,
    balance_transaction: objectId('txn'),
    created: world.clock.nowSeconds(),
    currency,
    description,
    destination: destination.id,
    destination_payment: objectId('py'),
    livemode: false,
    metadata,
    reversals: { object: 'list', data: [], has_more: false, url: `/v1/transfers/${id}/reversals` },
    reversed: false,
    source_transaction: null,
    source_type: sourceType,
    transfer_group: transferGroup,
  };
  world.transfers.add(transfer);
  world.emit({ type: 'transfer.created', object: transfer, request: eventRequest(call) });
  return expandObject(structuredClone(transfer), expand, expanders(world));
}

function updateTransfer(call: ProviderCall, world: ProviderWorld): Stripe.Transfer {
  requirePlatform(call);
  const transfer = requireTransfer(world, call.pathParams.id as string);
  const { params } = call;
  const description = params.nullableString('description', { maxLength: 5000 });
  const metadata = applyMetadataChange(transfer.metadata, params.metadata());
  const expand = params.stringList('expand');
  params.finish();

  const before = structuredClone(transfer);
  if (description !== undefined) transfer.description = description;
  transfer.metadata = metadata;
  const changed = previousAttributes(before, transfer);
  if (Object.keys(changed).length > 0) {
    world.emit({
      type: 'transfer.updated',
      object: transfer,
      previousAttributes: changed,
      request: eventRequest(call),
    });
  }
  return expandObject(structuredClone(transfer), expand, expanders(world));
}

function createReversal(call: ProviderCall, world: ProviderWorld): Stripe.TransferReversal {
  requirePlatform(call);
  const transfer = requireTransfer(world, call.pathParams.id as string);
  const { params } = call;
  const remaining = transfer.amount - transfer.amount_reversed;
  const amount = params.integer('amount', { min: 1 }) ?? remaining;
  // description is accepted, as the provider does, but a reversal object does not show it.
  params.string('description', { maxLength: 5000 });
  const metadata = applyMetadataChange({}, params.metadata());
  params.boolean('refund_application_fee');
  const expand = params.stringList('expand');
  params.finish();

  if (remaining === 0) {
    throw providerErrors.unexpectedState(
      `Transfer ${transfer.id} is already fully reversed.`,
      'transfer_already_reversed',
    );
  }
  if (amount > remaining) throw providerErrors.transferReversalTooLarge(remaining);
  const destinationId = transfer.destination as string;
  world.ledger.debitAvailable(destinationId, transfer.currency, amount);
  world.ledger.creditAvailable(world.platformAccountId, transfer.currency, amount);

  const reversal: Stripe.TransferReversal = {
    id: objectId('trr'),
    object: 'transfer_reversal',
    amount,
    balance_transaction: objectId('txn'),
    created: world.clock.nowSeconds(),
    currency: transfer.currency,
    destination_payment_refund: objectId('pyr'),
    metadata,
    source_refund: null,
    transfer: transfer.id,
  };
  const reversals = world.transferReversals.get(transfer.id) ?? [];
  reversals.push(reversal);
  world.transferReversals.set(transfer.id, reversals);

  const before = structuredClone(transfer);
  transfer.amount_reversed += amount;
  transfer.reversed = transfer.amount_reversed === transfer.amount;
  transfer.reversals = embeddedReversals(world, transfer.id);
  world.emit({
    type: 'transfer.reversed',
    object: transfer,
    previousAttributes: previousAttributes(before, transfer),
    request: eventRequest(call),
  });
  return expandObject(structuredClone(reversal), expand, {
    transfer: (id) => structuredClone(world.transfers.get(id)),
  });
}

export const transferRoutes: ProviderRoute[] = [
  { method: 'post', path: '/v1/transfers', handle: createTransfer },
  {
    method: 'get',
    path: '/v1/transfers',
    handle: (call, world) => {
      requirePlatform(call);
      const { params } = call;
      const query = readListQuery(params);
      const destination = params.string('destination');
      const transferGroup = params.string('transfer_group');
      const expand = params.stringList('expand');
      params.finish();
      const matching = world.transfers.newestFirst(
        (transfer) =>
          (destination === undefined || transfer.destination === destination) &&
          (transferGroup === undefined || transfer.transfer_group === transferGroup),
      );
      const page = structuredClone(listPage(matching, query, '/v1/transfers', 'transfer'));
      return { ...page, data: expandListData(page.data, expand, expanders(world)) };
    },
  },
  {
    method: 'get',
    path: '/v1/transfers/:id',
    handle: (call, world) => {
      requirePlatform(call);
      const transfer = requireTransfer(world, call.pathParams.id as string);
      const expand = call.params.stringList('expand');
      call.params.finish();
      return expandObject(structuredClone(transfer), expand, expanders(world));
    },
  },
  { method: 'post', path: '/v1/transfers/:id', handle: updateTransfer },
  { method: 'post', path: '/v1/transfers/:id/reversals', handle: createReversal },
  {
    method: 'get',
    path: '/v1/transfers/:id/reversals',
    handle: (call, world) => {
      requirePlatform(call);
      const transfer = requireTransfer(world, call.pathParams.id as string);
      const query = readListQuery(call.params);
      call.params.stringList('expand');
      call.params.finish();
      return structuredClone(
        listPage(
          reversalsNewestFirst(world, transfer.id),
          query,
          `/v1/transfers/${transfer.id}/reversals`,
          'transfer_reversal',
        ),
      );
    },
  },
  {
    method: 'get',
    path: '/v1/transfers/:id/reversals/:reversalId',
    handle: (call, world) => {
      requirePlatform(call);
      const transfer = requireTransfer(world, call.pathParams.id as string);
      const reversalId = call.pathParams.reversalId as string;
      const expand = call.params.stringList('expand');
      call.params.finish();
      const reversal = world.transferReversals.get(transfer.id)?.find((entry) => entry.id === reversalId);
      if (!reversal) throw providerErrors.resourceMissing('transfer_reversal', reversalId);
      return expandObject(structuredClone(reversal), expand, {
        transfer: (id) => structuredClone(world.transfers.get(id)),
      });
    },
  },
];
