// The Balance object (https://docs.stripe.com/api/balance/balance_object, SDK type `Stripe.Balance`):
// {object:'balance', available:[{amount,currency}], pending:[{amount,currency}], livemode}.
// GET /v1/balance answers for the platform, or for the connected account in Stripe-Account.

import type Stripe from 'stripe';
import type { ProviderRoute } from '../app/provider-route';
import type { ProviderWorld } from '../state/provider-world';

export function balanceOf(world: ProviderWorld, accountId: string): Stripe.Balance {
  const split = world.ledger.split(accountId, world.defaultCurrencyOf(accountId));
  return { object: 'balance', available: split.available, livemode: false, pending: split.pending };
}

export const balanceRoutes: ProviderRoute[] = [
  {
    method: 'get',
    path: '/v1/balance',
    handle: (call, world) => {
      call.params.stringList('expand');
      call.params.finish();
      return balanceOf(world, call.account.id);
    },
  },
];
