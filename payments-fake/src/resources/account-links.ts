// Account links. Object shape from https://docs.stripe.com/api/account_links/object and the SDK
// type `Stripe.AccountLink`: {object:'account_link', created, expires_at, url}. The URL is
// single-use and short-lived; a used or expired link sends the holder to refresh_url
// (https://docs.stripe.com/api/account_links/create, https://docs.stripe.com/connect/express-accounts).

import type Stripe from 'stripe';
import type { ProviderCall, ProviderRoute } from '../app/provider-route';
import { providerErrors } from '../errors/provider-error';
import { randomToken } from '../ids/object-id';
import type { AccountLinkRecord, ProviderWorld } from '../state/provider-world';
import { requirePlatform } from './acting-account';
import { expandObject } from './expand';

export const ACCOUNT_LINK_TYPES = ['account_onboarding', 'account_update'] as const;

export function onboardingPath(token: string): string {
  return `/onboarding/${token}`;
}

function createAccountLink(call: ProviderCall, world: ProviderWorld): Stripe.AccountLink {
  requirePlatform(call);
  const { params } = call;
  const accountId = params.string('account', { required: true }) as string;
  const type = params.oneOf('type', ACCOUNT_LINK_TYPES, { required: true }) as AccountLinkRecord['type'];
  const refreshUrl = params.url('refresh_url', { required: true }) as string;
  const returnUrl = params.url('return_url', { required: true }) as string;
  params.oneOf('collect', ['currently_due', 'eventually_due'] as const);
  const collection = params.hash('collection_options');
  if (collection) {
    collection.oneOf('fields', ['currently_due', 'eventually_due'] as const);
    collection.oneOf('future_requirements', ['include', 'omit'] as const);
  }
  const expand = params.stringList('expand');
  params.finish();

  const account = world.accounts.get(accountId);
  if (!account) throw providerErrors.referenceMissing('account', accountId, 'account');
  if (type === 'account_update' && account.type !== 'custom') {
    throw providerErrors.unexpectedState(
      `Account links of type account_update can only be made for custom accounts; ${accountId} is ${account.type}.`,
      'parameter_invalid_string',
      'type',
    );
  }

  const created = world.clock.nowSeconds();
  const token = randomToken(32);
  world.accountLinks.set(token, {
    token,
    accountId,
    type,
    refreshUrl,
    returnUrl,
    createdAt: created,
    expiresAt: created + world.options.onboardingLinkTtlSeconds,
    used: false,
  });
  const link: Stripe.AccountLink = {
    object: 'account_link',
    created,
    expires_at: created + world.options.onboardingLinkTtlSeconds,
    url: `${world.publicUrl}${onboardingPath(token)}`,
  };
  return expandObject(link, expand, {});
}

export const accountLinkRoutes: ProviderRoute[] = [
  { method: 'post', path: '/v1/account_links', handle: createAccountLink },
];
