// Connected accounts. Object shape from https://docs.stripe.com/api/accounts/object and the
// SDK's published type `Stripe.Account` (stripe 23.1.0, OpenAPI spec v2596), which the objects
// below are checked against at compile time. Endpoints: https://docs.stripe.com/api/accounts
// (create, retrieve, update, list, delete) and GET /v1/account.

import type Stripe from 'stripe';
import type { ProviderCall, ProviderRoute } from '../app/provider-route';
import { applyMetadataChange, type ParamReader } from '../encoding/param-reader';
import { providerErrors } from '../errors/provider-error';
import { previousAttributes } from '../events/previous-attributes';
import { objectId, randomToken } from '../ids/object-id';
import { listPage, readListQuery } from '../lists/list-page';
import type { ProviderWorld } from '../state/provider-world';
import { requirePlatform } from './acting-account';
import { expandObject } from './expand';

export const ACCOUNT_TYPES = ['express', 'custom', 'standard'] as const;
export const BUSINESS_TYPES = ['individual', 'company', 'non_profit', 'government_entity'] as const;
/** Capabilities a request may name (a subset of `Stripe.Account.Capabilities`). */
export const KNOWN_CAPABILITIES = [
  'card_payments',
  'transfers',
  'bank_transfer_payments',
  'link_payments',
  'sepa_debit_payments',
  'us_bank_account_ach_payments',
  'tax_reporting_us_1099_k',
  'tax_reporting_us_1099_misc',
] as const;

// Country → currency, ISO 4217 (common practice); the euro area listed by country.
const EURO_AREA = 'AT BE CY DE EE ES FI FR GR HR IE IT LT LU LV MT NL PT SI SK'.split(' ');
const COUNTRY_CURRENCIES: Record<string, string> = {
  US: 'usd',
  GB: 'gbp',
  CA: 'cad',
  AU: 'aud',
  NZ: 'nzd',
  CH: 'chf',
  SE: 'sek',
  NO: 'nok',
  DK: 'dkk',
  PL: 'pln',
  JP: 'jpy',
  SG: 'sgd',
  HK: 'hkd',
  MX: 'mxn',
  BR: 'brl',
  IN: 'inr',
};

export function currencyOfCountry(country: string): string {
  if (EURO_AREA.includes(country)) return 'eur';
  return COUNTRY_CURRENCIES[country] ?? 'usd';
}

// What a new individual account still owes before it may be paid (from memory of the
// provider's test-mode answers; the exact list varies by country and is illustrative).
const ONBOARDING_REQUIREMENTS = [
  'business_type',
  'external_account',
  'individual.dob.day',
  'individual.dob.month',
  'individual.dob.year',
  'individual.first_name',
  'individual.last_name',
  'tos_acceptance.date',
  'tos_acceptance.ip',
];

function requirements(outstanding: string[]): Stripe.Account.Requirements {
  return {
    alternatives: [],
    current_deadline: null,
    currently_due: [...outstanding],
    disabled_reason: outstanding.length > 0 ? 'requirements.past_due' : null,
    errors: [],
    eventually_due: [...outstanding],
    past_due: [...outstanding],
    pending_verification: [],
  };
}

function futureRequirements(): Stripe.Account.FutureRequirements {
  return {
    alternatives: [],
    current_deadline: null,
    currently_due: [],
    disabled_reason: null,
    errors: [],
    eventually_due: [],
    past_due: [],
    pending_verification: [],
  };
}

function emptyBusinessProfile(): Stripe.Account.BusinessProfile {
  return {
    mcc: null,
    minority_owned_business_designation: null,
    name: null,
    product_description: null,
    specified_commercial_transactions_act_url: null,
    support_address: null,
    support_email: null,
    support_phone: null,
    support_url: null,
    url: null,
  };
}

function readBusinessProfile(
  params: ParamReader,
  current: Stripe.Account.BusinessProfile,
): Stripe.Account.BusinessProfile {
  const profile = params.hash('business_profile');
  if (profile === undefined) return current;
  if (profile === null) return emptyBusinessProfile();
  const next = { ...current };
  const name = profile.nullableString('name', { maxLength: 5000 });
  if (name !== undefined) next.name = name;
  const url = profile.nullableString('url', { maxLength: 5000 });
  if (url !== undefined) next.url = url;
  const description = profile.nullableString('product_description', { maxLength: 40000 });
  if (description !== undefined) next.product_description = description;
  const mcc = profile.nullableString('mcc', { maxLength: 4 });
  if (mcc !== undefined) next.mcc = mcc;
  const supportEmail = profile.nullableString('support_email', { maxLength: 5000 });
  if (supportEmail !== undefined) next.support_email = supportEmail;
  const supportUrl = profile.nullableString('support_url', { maxLength: 5000 });
  if (supportUrl !== undefined) next.support_url = supportUrl;
  return next;
}

/** Requested capabilities: `capabilities[transfers][requested]=true`. */
function readCapabilityRequests(params: ParamReader): Map<string, boolean> | undefined {
  const capabilities = params.hash('capabilities');
  if (capabilities === undefined || capabilities === null) return undefined;
  const requests = new Map<string, boolean>();
  for (const name of capabilities.keys()) {
    if (!(KNOWN_CAPABILITIES as readonly string[]).includes(name)) {
      throw providerErrors.parameterUnknown(capabilities.nameOf(name));
    }
    const capability = capabilities.hash(name, { required: true });
    if (!capability) throw providerErrors.invalidObject(capabilities.nameOf(name));
    const requested = capability.boolean('requested', { required: true });
    requests.set(name, requested as boolean);
  }
  return requests;
}

function readTosAcceptance(params: ParamReader, current: Stripe.Account.TosAcceptance): Stripe.Account.TosAcceptance {
  const tos = params.hash('tos_acceptance');
  if (tos === undefined) return current;
  if (tos === null) return { date: null, ip: null, user_agent: null };
  const next = { ...current };
  const date = tos.integer('date', { min: 0 });
  if (date !== undefined) next.date = date;
  const ip = tos.nullableString('ip', { maxLength: 100 });
  if (ip !== undefined) next.ip = ip;
  const userAgent = tos.nullableString('user_agent', { maxLength: 5000 });
  if (userAgent !== undefined) next.user_agent = userAgent;
  const agreement = tos.oneOf('service_agreement', ['full', 'recipient'] as const);
  if (agreement !== undefined) next.service_agreement = agreement;
  return next;
}

function capabilityStatus(onboarded: boolean): 'active' | 'inactive' {
  return onboarded ? 'active' : 'inactive';
}

function applyCapabilityRequests(
  current: Stripe.Account.Capabilities,
  requests: Map<string, boolean> | undefined,
  onboarded: boolean,
): Stripe.Account.Capabilities {
  const next: Record<string, string> = { ...(current as Record<string, string>) };
  for (const [name, requested] of requests ?? []) {
    if (requested) next[name] = next[name] ?? capabilityStatus(onboarded);
    else delete next[name];
  }
  return next as Stripe.Account.Capabilities;
}

function chargesEnabled(account: Stripe.Account): boolean {
  // Charges need the card_payments capability; an account that only receives transfers never charges.
  return account.details_submitted && account.capabilities?.card_payments === 'active';
}

export function findAccount(world: ProviderWorld, id: string): Stripe.Account | undefined {
  return world.accounts.get(id);
}

/** The connected account in the path, or the provider's 403 for an account the key cannot reach. */
export function requireAccount(world: ProviderWorld, id: string, maskedKey: string): Stripe.Account {
  const account = world.accounts.get(id);
  if (!account) throw providerErrors.accountInvalid(maskedKey, id);
  return account;
}

function createAccount(call: ProviderCall, world: ProviderWorld): Stripe.Account {
  requirePlatform(call);
  const { params } = call;
  const type = params.oneOf('type', ACCOUNT_TYPES, { required: true }) as Stripe.Account.Type;
  const country = params.country('country') ?? world.platformCountry;
  const email = params.email('email') ?? null;
  const businessType = params.oneOf('business_type', BUSINESS_TYPES) ?? null;
  const defaultCurrency = params.currency('default_currency') ?? currencyOfCountry(country);
  const metadata = applyMetadataChange({}, params.metadata());
  const capabilityRequests = readCapabilityRequests(params);
  const businessProfile = readBusinessProfile(params, emptyBusinessProfile());
  const tosAcceptance = readTosAcceptance(params, { date: null, ip: null, user_agent: null });
  const expand = params.stringList('expand');
  params.finish();

  const id = objectId('acct', 16);
  const account: Stripe.Account = {
    id,
    object: 'account',
    business_profile: businessProfile,
    business_type: businessType,
    capabilities: applyCapabilityRequests({}, capabilityRequests, false),
    charges_enabled: false,
    country,
    created: world.clock.nowSeconds(),
    default_currency: defaultCurrency,
    details_submitted: false,
    email,
    external_accounts: { object: 'list', data: [], has_more: false, url: `/v1/accounts/${id}/external_accounts` },
    future_requirements: futureRequirements(),
    metadata,
    payouts_enabled: false,
    requirements: requirements(ONBOARDING_REQUIREMENTS.filter((item) => !(item === 'business_type' && businessType))),
    tos_acceptance: tosAcceptance,
    type,
  };
  world.accounts.add(account);
  return expandObject(structuredClone(account), expand, {});
}

function updateAccount(call: ProviderCall, world: ProviderWorld): Stripe.Account {
  requirePlatform(call);
  const account = requireAccount(world, call.pathParams.id as string, call.maskedKey);
  const { params } = call;
  const before = structuredClone(account);
  const email = params.email('email');
  const businessType = params.oneOf('business_type', BUSINESS_TYPES);
  const defaultCurrency = params.currency('default_currency');
  const metadata = applyMetadataChange(account.metadata ?? {}, params.metadata());
  const capabilityRequests = readCapabilityRequests(params);
  const businessProfile = readBusinessProfile(params, account.business_profile ?? emptyBusinessProfile());
  const tosAcceptance = readTosAcceptance(params, account.tos_acceptance ?? {});
  const expand = params.stringList('expand');
  params.finish();

  if (email !== undefined) account.email = email;
  if (businessType !== undefined) account.business_type = businessType;
  if (defaultCurrency !== undefined) account.default_currency = defaultCurrency;
  account.metadata = metadata;
  account.business_profile = businessProfile;
  account.tos_acceptance = tosAcceptance;
  account.capabilities = applyCapabilityRequests(
    account.capabilities ?? {},
    capabilityRequests,
    account.details_submitted,
  );
  account.charges_enabled = chargesEnabled(account);
  if (account.requirements && businessType) {
    const outstanding = (account.requirements.currently_due ?? []).filter((item) => item !== 'business_type');
    account.requirements = requirements(outstanding);
  }

  const changed = previousAttributes(before, account);
  if (Object.keys(changed).length > 0) {
    world.emit({
      type: 'account.updated',
      object: account,
      previousAttributes: changed,
      account: account.id,
      request: { id: call.request.id, idempotencyKey: call.request.idempotencyKey },
    });
  }
  return expandObject(structuredClone(account), expand, {});
}

/**
 * Marks onboarding as done, as when the account holder finishes the hosted page: details
 * submitted, requested capabilities active, a payout bank account on file, payouts enabled.
 */
export function completeOnboarding(
  world: ProviderWorld,
  accountId: string,
  holder: { name: string; ip: string | null; userAgent: string | null },
): Stripe.Account | undefined {
  const account = world.accounts.get(accountId);
  if (!account) return undefined;
  const before = structuredClone(account);
  const capabilities: Record<string, string> = {};
  for (const name of Object.keys(account.capabilities ?? {})) capabilities[name] = 'active';
  account.capabilities = capabilities as Stripe.Account.Capabilities;
  account.details_submitted = true;
  account.payouts_enabled = true;
  account.business_type = account.business_type ?? 'individual';
  account.requirements = requirements([]);
  account.tos_acceptance = {
    ...account.tos_acceptance,
    date: account.tos_acceptance?.date ?? world.clock.nowSeconds(),
    ip: account.tos_acceptance?.ip ?? holder.ip,
    user_agent: account.tos_acceptance?.user_agent ?? holder.userAgent,
  };
  if ((account.external_accounts?.data.length ?? 0) === 0) {
    const bankAccount: Stripe.BankAccount = {
      id: objectId('ba'),
      object: 'bank_account',
      account: account.id,
      account_holder_name: holder.name,
      account_holder_type: 'individual',
      account_type: null,
      bank_name: 'TEST BANK',
      country: account.country ?? world.platformCountry,
      currency: account.default_currency ?? world.platformCurrency,
      default_for_currency: true,
      fingerprint: randomToken(16),
      last4: '6789',
      metadata: {},
      routing_number: '110000000',
      status: 'new',
    };
    account.external_accounts = {
      object: 'list',
      data: [bankAccount],
      has_more: false,
      url: `/v1/accounts/${account.id}/external_accounts`,
    };
  }
  account.charges_enabled = chargesEnabled(account);
  world.emit({
    type: 'account.updated',
    object: account,
    previousAttributes: previousAttributes(before, account),
    account: account.id,
  });
  return account;
}

function platformAccount(world: ProviderWorld): Stripe.Account {
  return {
    id: world.platformAccountId,
    object: 'account',
    business_profile: { ...emptyBusinessProfile(), name: 'Evenhand local platform' },
    business_type: 'company',
    capabilities: { card_payments: 'active', transfers: 'active' },
    charges_enabled: true,
    country: world.platformCountry,
    default_currency: world.platformCurrency,
    details_submitted: true,
    email: 'platform@evenhand.test',
    metadata: {},
    payouts_enabled: true,
    requirements: requirements([]),
    type: 'standard',
  };
}

export const accountRoutes: ProviderRoute[] = [
  { method: 'post', path: '/v1/accounts', handle: createAccount },
  {
    method: 'get',
    path: '/v1/accounts',
    handle: (call, world) => {
      requirePlatform(call);
      const query = readListQuery(call.params);
      call.params.stringList('expand');
      call.params.finish();
      return structuredClone(listPage(world.accounts.newestFirst(), query, '/v1/accounts', 'account'));
    },
  },
  {
    method: 'get',
    path: '/v1/accounts/:id',
    handle: (call, world) => {
      const id = call.pathParams.id as string;
      if (!call.account.isPlatform && call.account.id !== id) throw providerErrors.accountInvalid(call.maskedKey, id);
      const account =
        id === world.platformAccountId ? platformAccount(world) : requireAccount(world, id, call.maskedKey);
      const expand = call.params.stringList('expand');
      call.params.finish();
      return expandObject(structuredClone(account), expand, {});
    },
  },
  { method: 'post', path: '/v1/accounts/:id', handle: updateAccount },
  {
    method: 'delete',
    path: '/v1/accounts/:id',
    handle: (call, world) => {
      requirePlatform(call);
      const account = requireAccount(world, call.pathParams.id as string, call.maskedKey);
      call.params.finish();
      world.accounts.remove(account.id);
      const deleted: Stripe.DeletedAccount = { id: account.id, object: 'account', deleted: true };
      return deleted;
    },
  },
  {
    method: 'get',
    path: '/v1/account',
    handle: (call, world) => {
      const expand = call.params.stringList('expand');
      call.params.finish();
      const account = call.account.isPlatform
        ? platformAccount(world)
        : requireAccount(world, call.account.id, call.maskedKey);
      return expandObject(structuredClone(account), expand, {});
    },
  },
];
