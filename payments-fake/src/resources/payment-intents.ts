// Payment intents, used to top up the platform balance by card. Shape from
// https://docs.stripe.com/api/payment_intents/object (SDK type `Stripe.PaymentIntent`); statuses
// requires_payment_method → requires_confirmation → succeeded, or back to requires_payment_method
// with last_payment_error after a decline (402 card_error, https://docs.stripe.com/declines/codes).
// Test payment methods as published at https://docs.stripe.com/testing (pm_card_visa, …).
// The browser script confirms and retrieves with a publishable key and the client_secret, sending
// the typed card as payment_method_data (https://docs.stripe.com/api/payment_intents/confirm); it
// gets the subset of fields a publishable key may read.

import type { PaymentIntent as BrowserPaymentIntent } from '@stripe/stripe-js';
import type Stripe from 'stripe';
import type { ProviderCall, ProviderRoute } from '../app/provider-route';
import { expiryProblem, passesLuhn } from '../cards/card-checks';
import { testPaymentMethodForCard } from '../cards/test-cards';
import { applyMetadataChange, type ParamReader } from '../encoding/param-reader';
import { ProviderError, providerErrors } from '../errors/provider-error';
import { previousAttributes } from '../events/previous-attributes';
import { objectId, randomToken } from '../ids/object-id';
import { listPage, readListQuery } from '../lists/list-page';
import type { ProviderWorld } from '../state/provider-world';
import { requirePlatform } from './acting-account';
import { expandObject } from './expand';

type CardOutcome =
  | { kind: 'succeeds'; bypassPending: boolean }
  | { kind: 'declined'; code: string; declineCode: string; message: string };

/** The provider's test payment methods this stand-in knows (https://docs.stripe.com/testing). */
export const TEST_PAYMENT_METHODS: Record<string, CardOutcome> = {
  pm_card_visa: { kind: 'succeeds', bypassPending: false },
  pm_card_visa_debit: { kind: 'succeeds', bypassPending: false },
  pm_card_mastercard: { kind: 'succeeds', bypassPending: false },
  pm_card_amex: { kind: 'succeeds', bypassPending: false },
  pm_card_discover: { kind: 'succeeds', bypassPending: false },
  pm_card_bypassPending: { kind: 'succeeds', bypassPending: true },
  pm_card_chargeDeclined: {
    kind: 'declined',
    code: 'card_declined',
    declineCode: 'generic_decline',
    message: 'Your card was declined.',
  },
  pm_card_chargeDeclinedInsufficientFunds: {
    kind: 'declined',
    code: 'card_declined',
    declineCode: 'insufficient_funds',
    message: 'Your card has insufficient funds.',
  },
  pm_card_chargeDeclinedExpiredCard: {
    kind: 'declined',
    code: 'expired_card',
    declineCode: 'expired_card',
    message: 'Your card has expired.',
  },
};

// A number that passes the checks but is none of the test cards: the provider's test mode declines
// a real card (decline code test_mode_live_card, https://docs.stripe.com/declines/codes).
const NOT_A_TEST_CARD: CardOutcome = {
  kind: 'declined',
  code: 'card_declined',
  declineCode: 'test_mode_live_card',
  message: 'Your card was declined: this is test mode, so only the published test card numbers work.',
};

// The fields a publishable key may read: exactly those of the browser library's own PaymentIntent
// type (@stripe/stripe-js 10.2.1, dist/api/payment-intents.d.ts): `satisfies` refuses a field it lacks,
// and `everyBrowserFieldListed` fails to compile when it has one the list lacks.
const PUBLISHABLE_FIELDS = [
  'id',
  'object',
  'amount',
  'canceled_at',
  'cancellation_reason',
  'capture_method',
  'client_secret',
  'confirmation_method',
  'created',
  'currency',
  'description',
  'last_payment_error',
  'livemode',
  'next_action',
  'payment_method',
  'payment_method_types',
  'receipt_email',
  'setup_future_usage',
  'shipping',
  'status',
] as const satisfies readonly (keyof Stripe.PaymentIntent & keyof BrowserPaymentIntent)[];
const _everyBrowserFieldListed: Exclude<keyof BrowserPaymentIntent, (typeof PUBLISHABLE_FIELDS)[number]> extends never
  ? true
  : never = true;

/** What the caller may see: everything with a secret key, the browser subset with a publishable key. */
function presentIntent(intent: Stripe.PaymentIntent, call: ProviderCall): Partial<Stripe.PaymentIntent> {
  const copy = structuredClone(intent);
  if (call.keyKind === 'secret') return copy;
  const shown: Record<string, unknown> = {};
  for (const field of PUBLISHABLE_FIELDS) shown[field] = copy[field];
  return shown as Partial<Stripe.PaymentIntent>;
}

/** A publishable key must show the intent's client_secret; a secret key may, and then it must match. */
function checkClientSecret(intent: Stripe.PaymentIntent, clientSecret: string | undefined, call: ProviderCall): void {
  if (clientSecret === undefined) {
    if (call.keyKind === 'publishable') throw providerErrors.parameterMissing('client_secret');
    return;
  }
  if (clientSecret !== intent.client_secret) throw providerErrors.clientSecretMismatch();
}

interface TypedCard {
  number: string;
}

/** `payment_method_data` as the browser script sends it: a card typed into the form. */
function readTypedCard(params: ParamReader, call: ProviderCall, now: Date): TypedCard | undefined {
  const data = params.hash('payment_method_data');
  if (!data) return undefined;
  data.oneOf('type', ['card'] as const, { required: true });
  const card = data.hash('card', { required: true });
  if (!card) throw providerErrors.parameterMissing(data.nameOf('card'));
  if (call.keyKind !== 'publishable') throw providerErrors.cardDataNeedsPublishableKey();
  const number = card.string('number', { required: true, maxLength: 30 }) as string;
  const expMonth = card.integer('exp_month', { required: true }) as number;
  const expYear = card.integer('exp_year', { required: true }) as number;
  const cvc = card.string('cvc', { maxLength: 10 });
  readBillingDetails(data);

  const digits = number.replace(/[\s-]/g, '');
  if (!/^\d{12,19}$/.test(digits) || !passesLuhn(digits)) {
    throw providerErrors.cardRejected('incorrect_number', 'Your card number is incorrect.', card.nameOf('number'));
  }
  const expiry = expiryProblem(expMonth, expYear, now);
  if (expiry) {
    const isMonth = expiry.code === 'invalid_expiry_month' || expiry.code === 'invalid_expiry_month_past';
    throw providerErrors.cardRejected(
      isMonth ? 'invalid_expiry_month' : 'invalid_expiry_year',
      expiry.message,
      card.nameOf(isMonth ? 'exp_month' : 'exp_year'),
    );
  }
  if (cvc !== undefined && !/^\d{3,4}$/.test(cvc)) {
    throw providerErrors.cardRejected('invalid_cvc', "Your card's security code is invalid.", card.nameOf('cvc'));
  }
  return { number: digits };
}

/** Billing details are taken (the browser may send a name and postal code) but not kept. */
function readBillingDetails(data: ParamReader): void {
  const billing = data.hash('billing_details');
  if (!billing) return;
  billing.string('name', { maxLength: 500 });
  billing.email('email');
  billing.string('phone', { maxLength: 50 });
  const address = billing.hash('address');
  if (!address) return;
  for (const field of ['line1', 'line2', 'city', 'state', 'postal_code']) address.string(field, { maxLength: 200 });
  address.country('country');
}

// Smallest chargeable amounts in minor units (from memory of https://docs.stripe.com/currencies#minimum-and-maximum-charge-amounts).
const MINIMUM_CHARGE: Record<string, number> = {
  usd: 50,
  eur: 50,
  gbp: 30,
  cad: 50,
  aud: 50,
  chf: 50,
  jpy: 50,
  nzd: 50,
  sek: 300,
  nok: 300,
  dkk: 250,
};
const MAXIMUM_AMOUNT = 99_999_999;

const UPDATABLE_STATUSES = ['requires_payment_method', 'requires_confirmation'];

function requireIntent(world: ProviderWorld, id: string): Stripe.PaymentIntent {
  const intent = world.paymentIntents.get(id);
  if (!intent) throw providerErrors.resourceMissing('payment_intent', id);
  return intent;
}

function readAmount(params: ParamReader, currency: string | undefined, required: boolean): number | undefined {
  const amount = params.integer('amount', { required, min: 1, max: MAXIMUM_AMOUNT });
  if (amount !== undefined && currency !== undefined) {
    const minimum = MINIMUM_CHARGE[currency] ?? 50;
    if (amount < minimum) throw providerErrors.amountTooSmall('amount', minimum, currency);
  }
  return amount;
}

function readPaymentMethod(params: ParamReader): string | undefined {
  const id = params.string('payment_method');
  if (id !== undefined && !(id in TEST_PAYMENT_METHODS)) {
    throw providerErrors.referenceMissing('PaymentMethod', id, 'payment_method');
  }
  return id;
}

function unexpectedState(intent: Stripe.PaymentIntent, action: string): ProviderError {
  return providerErrors.unexpectedState(
    `You cannot ${action} this PaymentIntent because it has a status of ${intent.status}.`,
    'payment_intent_unexpected_state',
  );
}

function eventRequest(call: ProviderCall) {
  return { id: call.request.id, idempotencyKey: call.request.idempotencyKey };
}

/**
 * Confirms with the test card: success credits the platform balance, a decline is a 402.
 * `typedOutcome` is for a typed card that is none of the test cards.
 */
function confirmIntent(
  world: ProviderWorld,
  intent: Stripe.PaymentIntent,
  call: ProviderCall,
  typedOutcome?: CardOutcome,
): void {
  const paymentMethod = (intent.payment_method as string | null) ?? null;
  if (!paymentMethod && !typedOutcome) {
    throw providerErrors.unexpectedState(
      'You cannot confirm this PaymentIntent because it has no payment method. Send payment_method.',
      'payment_intent_unexpected_state',
      'payment_method',
    );
  }
  const outcome = typedOutcome ?? TEST_PAYMENT_METHODS[paymentMethod as string];
  if (!outcome) throw providerErrors.referenceMissing('PaymentMethod', paymentMethod as string, 'payment_method');
  const before = structuredClone(intent);
  // A test payment method id stands for a fresh card; the intent keeps the card's own id.
  intent.payment_method = objectId('pm');
  intent.latest_charge = objectId('ch');

  if (outcome.kind === 'declined') {
    intent.status = 'requires_payment_method';
    intent.last_payment_error = {
      type: 'card_error',
      code: outcome.code as Stripe.PaymentIntent.LastPaymentError.Code,
      decline_code: outcome.declineCode,
      message: outcome.message,
      charge: intent.latest_charge,
      doc_url: `https://docs.stripe.com/error-codes/${outcome.code.replace(/_/g, '-')}`,
    };
    intent.payment_method = null;
    world.emit({
      type: 'payment_intent.payment_failed',
      object: intent,
      previousAttributes: previousAttributes(before, intent),
      request: eventRequest(call),
    });
    throw new ProviderError(402, {
      type: 'card_error',
      code: outcome.code,
      decline_code: outcome.declineCode,
      message: outcome.message,
      doc_url: `https://docs.stripe.com/error-codes/${outcome.code.replace(/_/g, '-')}`,
      payment_intent: presentIntent(intent, call),
    });
  }

  intent.status = 'succeeded';
  intent.amount_received = intent.amount;
  intent.last_payment_error = null;
  const pendingMs = outcome.bypassPending ? 0 : world.options.fundsPendingMs;
  if (pendingMs === 0) {
    world.ledger.creditAvailable(world.platformAccountId, intent.currency, intent.amount);
  } else {
    world.ledger.creditPending(
      world.platformAccountId,
      intent.currency,
      intent.amount,
      world.clock.nowMs() + pendingMs,
    );
    world.scheduleFundsRelease();
  }
  world.emit({
    type: 'payment_intent.succeeded',
    object: intent,
    previousAttributes: previousAttributes(before, intent),
    request: eventRequest(call),
  });
}

function createIntent(call: ProviderCall, world: ProviderWorld): Stripe.PaymentIntent {
  requirePlatform(call);
  const { params } = call;
  const currency = params.currency('currency', { required: true }) as string;
  const amount = readAmount(params, currency, true) as number;
  // API versions of the 2026 releases name the list allowed_payment_method_types; older clients
  // (and the browser library) still send payment_method_types.
  const allowedTypes = params.stringList('allowed_payment_method_types');
  const legacyTypes = params.stringList('payment_method_types');
  if (allowedTypes && legacyTypes)
    throw providerErrors.parametersExclusive(['allowed_payment_method_types', 'payment_method_types']);
  const paymentMethodTypes = allowedTypes ?? legacyTypes;
  params.stringList('excluded_payment_method_types');
  const automatic = params.hash('automatic_payment_methods');
  const automaticEnabled = automatic ? automatic.boolean('enabled', { required: true }) : undefined;
  if (automatic) automatic.oneOf('allow_redirects', ['always', 'never'] as const);
  const paymentMethod = readPaymentMethod(params);
  const confirm = params.boolean('confirm') ?? false;
  params.url('return_url');
  const description = params.string('description', { maxLength: 1000 }) ?? null;
  const receiptEmail = params.email('receipt_email') ?? null;
  const statementDescriptor = params.string('statement_descriptor', { maxLength: 22 }) ?? null;
  const statementDescriptorSuffix = params.string('statement_descriptor_suffix', { maxLength: 22 }) ?? null;
  params.oneOf('capture_method', ['automatic', 'automatic_async'] as const);
  params.oneOf('confirmation_method', ['automatic'] as const);
  const transferGroup = params.string('transfer_group') ?? null;
  const metadata = applyMetadataChange({}, params.metadata());
  const expand = params.stringList('expand');
  params.finish();

  if (paymentMethodTypes && automaticEnabled) {
    throw providerErrors.parametersExclusive([
      'automatic_payment_methods',
      allowedTypes ? 'allowed_payment_method_types' : 'payment_method_types',
    ]);
  }
  const id = objectId('pi');
  const intent: Stripe.PaymentIntent = {
    id,
    object: 'payment_intent',
    allowed_payment_method_types: (allowedTypes ?? null) as Stripe.PaymentIntent['allowed_payment_method_types'],
    amount,
    amount_capturable: 0,
    amount_received: 0,
    application: null,
    application_fee_amount: null,
    automatic_payment_methods: automaticEnabled ? { allow_redirects: 'always', enabled: true } : null,
    canceled_at: null,
    cancellation_reason: null,
    capture_method: 'automatic_async',
    client_secret: `${id}_secret_${randomToken(24)}`,
    confirmation_method: 'automatic',
    created: world.clock.nowSeconds(),
    currency,
    customer: null,
    customer_account: null,
    description,
    excluded_payment_method_types: null,
    last_payment_error: null,
    latest_charge: null,
    livemode: false,
    managed_payments: null,
    metadata,
    next_action: null,
    on_behalf_of: null,
    payment_method: paymentMethod ?? null,
    payment_method_configuration_details: null,
    payment_method_options: {
      card: { installments: null, mandate_options: null, network: null, request_three_d_secure: 'automatic' },
    },
    payment_method_types: paymentMethodTypes ?? ['card'],
    payment_record: null,
    processing: null,
    receipt_email: receiptEmail,
    review: null,
    setup_future_usage: null,
    shipping: null,
    source: null,
    statement_descriptor: statementDescriptor,
    statement_descriptor_suffix: statementDescriptorSuffix,
    status: paymentMethod ? 'requires_confirmation' : 'requires_payment_method',
    transfer_group: transferGroup,
  };
  world.paymentIntents.add(intent);
  world.emit({ type: 'payment_intent.created', object: intent, request: eventRequest(call) });
  if (confirm) confirmIntent(world, intent, call);
  return expandObject(structuredClone(intent), expand, {});
}

function updateIntent(call: ProviderCall, world: ProviderWorld): Stripe.PaymentIntent {
  requirePlatform(call);
  const intent = requireIntent(world, call.pathParams.id as string);
  const { params } = call;
  const currency = params.currency('currency');
  const amount = readAmount(params, currency ?? intent.currency, false);
  const paymentMethod = readPaymentMethod(params);
  const description = params.nullableString('description', { maxLength: 1000 });
  const receiptEmail = params.email('receipt_email');
  const metadata = applyMetadataChange(intent.metadata, params.metadata());
  const expand = params.stringList('expand');
  params.finish();
  if (!UPDATABLE_STATUSES.includes(intent.status)) throw unexpectedState(intent, 'update');

  if (currency !== undefined) intent.currency = currency;
  if (amount !== undefined) intent.amount = amount;
  if (paymentMethod !== undefined) {
    intent.payment_method = paymentMethod;
    intent.status = 'requires_confirmation';
  }
  if (description !== undefined) intent.description = description;
  if (receiptEmail !== undefined) intent.receipt_email = receiptEmail;
  intent.metadata = metadata;
  return expandObject(structuredClone(intent), expand, {});
}

export const paymentIntentRoutes: ProviderRoute[] = [
  { method: 'post', path: '/v1/payment_intents', handle: createIntent },
  {
    method: 'get',
    path: '/v1/payment_intents',
    handle: (call, world) => {
      requirePlatform(call);
      const query = readListQuery(call.params);
      call.params.stringList('expand');
      call.params.finish();
      return structuredClone(
        listPage(world.paymentIntents.newestFirst(), query, '/v1/payment_intents', 'payment_intent'),
      );
    },
  },
  {
    method: 'get',
    path: '/v1/payment_intents/:id',
    publishable: true,
    handle: (call, world) => {
      requirePlatform(call);
      const intent = requireIntent(world, call.pathParams.id as string);
      const clientSecret = call.params.string('client_secret');
      const expand = call.params.stringList('expand');
      call.params.finish();
      checkClientSecret(intent, clientSecret, call);
      return expandObject(presentIntent(intent, call), expand, {});
    },
  },
  { method: 'post', path: '/v1/payment_intents/:id', handle: updateIntent },
  {
    method: 'post',
    path: '/v1/payment_intents/:id/confirm',
    publishable: true,
    handle: (call, world) => {
      requirePlatform(call);
      const intent = requireIntent(world, call.pathParams.id as string);
      const { params } = call;
      const clientSecret = params.string('client_secret');
      checkClientSecret(intent, clientSecret, call);
      const paymentMethod = readPaymentMethod(params);
      const typedCard = readTypedCard(params, call, new Date(world.clock.nowMs()));
      if (paymentMethod !== undefined && typedCard)
        throw providerErrors.parametersExclusive(['payment_method', 'payment_method_data']);
      params.url('return_url');
      const receiptEmail = params.email('receipt_email');
      const expand = params.stringList('expand');
      params.finish();
      if (!UPDATABLE_STATUSES.includes(intent.status)) throw unexpectedState(intent, 'confirm');
      const typedPaymentMethod = typedCard ? testPaymentMethodForCard(typedCard.number) : undefined;
      if (paymentMethod !== undefined) intent.payment_method = paymentMethod;
      if (typedPaymentMethod !== undefined) intent.payment_method = typedPaymentMethod;
      if (receiptEmail !== undefined) intent.receipt_email = receiptEmail;
      confirmIntent(world, intent, call, typedCard && !typedPaymentMethod ? NOT_A_TEST_CARD : undefined);
      return expandObject(presentIntent(intent, call), expand, {});
    },
  },
  {
    method: 'post',
    path: '/v1/payment_intents/:id/cancel',
    handle: (call, world) => {
      requirePlatform(call);
      const intent = requireIntent(world, call.pathParams.id as string);
      const reason = call.params.oneOf('cancellation_reason', [
        'abandoned',
        'duplicate',
        'fraudulent',
        'requested_by_customer',
      ] as const);
      const expand = call.params.stringList('expand');
      call.params.finish();
      if (intent.status === 'succeeded' || intent.status === 'canceled') throw unexpectedState(intent, 'cancel');
      const before = structuredClone(intent);
      intent.status = 'canceled';
      intent.canceled_at = world.clock.nowSeconds();
      intent.cancellation_reason = reason ?? null;
      world.emit({
        type: 'payment_intent.canceled',
        object: intent,
        previousAttributes: previousAttributes(before, intent),
        request: eventRequest(call),
      });
      return expandObject(structuredClone(intent), expand, {});
    },
  },
];
