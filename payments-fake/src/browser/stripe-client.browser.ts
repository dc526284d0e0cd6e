// What `Stripe(publishableKey, options)` returns in the stand-in: the part of the provider's
// browser API the app uses — elements(), confirmCardPayment() and retrievePaymentIntent()
// (https://docs.stripe.com/js/payment_intents/confirm_card_payment,
// https://docs.stripe.com/js/payment_intents/retrieve_payment_intent) — talking to the stand-in's
// REST API with the publishable key, form-encoded, as the provider's library talks to its own.

import type {
  ConfirmCardPaymentData,
  PaymentIntent,
  PaymentIntentResult,
  Stripe,
  StripeConstructorOptions,
  StripeError,
} from '@stripe/stripe-js';
import { CardElementStandIn } from './card-element.browser';
import { ElementsGroupStandIn, type ElementsGroupOptions } from './elements-group.browser';
import { encodeForm, type FormInput } from './form-encoding';
import { IntegrationError } from './integration-error';

type ProviderAnswer = { body: unknown; error?: undefined } | { body?: undefined; error: StripeError };
type FormParams = { [key: string]: FormInput };
type ConfirmParams = { params: FormParams; error?: undefined } | { params?: undefined; error: StripeError };

// Methods of the provider's object the stand-in does not offer; calling one says so plainly
// instead of failing with "is not a function" somewhere deep in the app.
const NOT_OFFERED = [
  'confirmPayment',
  'confirmSetup',
  'confirmCardSetup',
  'createPaymentMethod',
  'createToken',
  'createSource',
  'createConfirmationToken',
  'handleCardAction',
  'handleNextAction',
  'paymentRequest',
  'redirectToCheckout',
  'retrieveSetupIntent',
  'initCheckout',
  'initEmbeddedCheckout',
] as const;

const SUPPORTED_DATA = ['payment_method', 'receipt_email', 'return_url'];

function paymentIntentId(clientSecret: unknown, method: string): string {
  const match = typeof clientSecret === 'string' ? /^(pi_[A-Za-z0-9]+)_secret_[A-Za-z0-9]+$/.exec(clientSecret) : null;
  if (!match) {
    throw new IntegrationError(
      `${method}() needs the PaymentIntent's client_secret, of the form pi_…_secret_…; it got ${JSON.stringify(clientSecret)}.`,
    );
  }
  return match[1] as string;
}

export function createStripeClient(apiOrigin: string, publishableKey: string, options: StripeConstructorOptions = {}) {
  async function call(method: 'GET' | 'POST', path: string, params: FormParams): Promise<ProviderAnswer> {
    const encoded = encodeForm(params);
    const headers: Record<string, string> = { Authorization: `Bearer ${publishableKey}` };
    if (method === 'POST') headers['Content-Type'] = 'application/x-www-form-urlencoded';
    if (options.apiVersion) headers['Stripe-Version'] = options.apiVersion;
    if (options.stripeAccount) headers['Stripe-Account'] = options.stripeAccount;
    const url = `${apiOrigin}${path}${method === 'GET' && encoded ? `?${encoded}` : ''}`;
    let response: Response;
    try {
      response = await fetch(url, {
        method,
        headers,
        body: method === 'POST' ? encoded : undefined,
        mode: 'cors',
        credentials: 'omit',
        cache: 'no-store',
      });
    } catch {
      return {
        error: {
          type: 'api_connection_error',
          message: `Could not reach the payments stand-in at ${apiOrigin}. Is it running?`,
        },
      };
    }
    const body: unknown = await response.json().catch(() => undefined);
    if (response.ok) return { body };
    const error = (body as { error?: StripeError } | undefined)?.error;
    if (error && typeof error === 'object' && typeof error.type === 'string') return { error };
    return {
      error: {
        type: 'api_error',
        message: `The payments stand-in answered ${response.status} without an error object.`,
      },
    };
  }

  function intentResult(answer: ProviderAnswer): PaymentIntentResult {
    return answer.error ? { error: answer.error } : { paymentIntent: answer.body as PaymentIntent };
  }

  /** `payment_method` as the page passes it → the confirm request's own parameters, or the form's first problem. */
  function paymentMethodParams(paymentMethod: ConfirmCardPaymentData['payment_method']): ConfirmParams {
    if (paymentMethod === undefined) return { params: {} };
    if (typeof paymentMethod === 'string') return { params: { payment_method: paymentMethod } };
    const { card, billing_details: billingDetails, ...rest } = paymentMethod;
    const unsupported = Object.keys(rest);
    if (unsupported.length > 0)
      throw new IntegrationError(`payment_method.${unsupported[0]} is not supported by the payments stand-in.`);
    const typed = CardElementStandIn.typedCard(card, new Date());
    if (!typed)
      throw new IntegrationError('payment_method.card must be the card element made by elements().create("card").');
    if (!CardElementStandIn.isMounted(card as CardElementStandIn)) {
      throw new IntegrationError(
        'The card element must be mounted when you confirm, so the payer can see what they typed.',
      );
    }
    if (typed.check.firstProblem) {
      CardElementStandIn.revealProblems(card as CardElementStandIn);
      const { code, message } = typed.check.firstProblem;
      return { error: { type: 'validation_error', code, message } };
    }
    const billing: FormParams = { ...(billingDetails as FormParams | undefined) };
    if (typed.postalCode) {
      const address = (billing.address ?? {}) as FormParams;
      billing.address = { ...address, postal_code: address.postal_code ?? typed.postalCode };
    }
    return {
      params: {
        payment_method_data: {
          type: 'card',
          card: { number: typed.number, exp_month: typed.expMonth, exp_year: typed.expYear, cvc: typed.cvc },
          billing_details: Object.keys(billing).length > 0 ? billing : undefined,
        },
      },
    };
  }

  // Typed with the provider library's own signatures, so a drift in @stripe/stripe-js fails the build.
  // The third argument (handleActions) has nothing to do here: test cards never ask for 3-D Secure.
  const confirmCardPayment: Stripe['confirmCardPayment'] = (clientSecret, data = {}) => {
    const id = paymentIntentId(clientSecret, 'confirmCardPayment');
    const unsupported = Object.keys(data).filter((key) => !SUPPORTED_DATA.includes(key));
    if (unsupported.length > 0) {
      throw new IntegrationError(
        `confirmCardPayment() data.${unsupported[0]} is not supported by the payments stand-in (it takes ${SUPPORTED_DATA.join(', ')}).`,
      );
    }
    const method = paymentMethodParams(data.payment_method);
    if (method.error) return Promise.resolve({ error: method.error });
    return call('POST', `/v1/payment_intents/${id}/confirm`, {
      client_secret: clientSecret,
      ...method.params,
      receipt_email: data.receipt_email,
      return_url: data.return_url,
    }).then(intentResult);
  };

  const retrievePaymentIntent: Stripe['retrievePaymentIntent'] = (clientSecret) => {
    const id = paymentIntentId(clientSecret, 'retrievePaymentIntent');
    return call('GET', `/v1/payment_intents/${id}`, { client_secret: clientSecret }).then(intentResult);
  };

  const client: Record<string, unknown> = {
    elements: (elementsOptions?: ElementsGroupOptions) => new ElementsGroupStandIn(elementsOptions),
    confirmCardPayment,
    retrievePaymentIntent,
    // @stripe/stripe-js announces itself here after loadStripe() (name, version, start time); nothing to keep.
    _registerWrapper: () => undefined,
  };
  for (const name of NOT_OFFERED) {
    client[name] = () => {
      throw new IntegrationError(
        `stripe.${name}() is not offered by the payments stand-in; it offers elements() with the card element, confirmCardPayment() and retrievePaymentIntent().`,
      );
    };
  }
  return client;
}
