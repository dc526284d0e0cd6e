// The stand-in for the provider's browser script, served by payments-fake at /v1/stripe.js.
// Included with a plain <script src> before the app, it defines window.Stripe, so that
// @stripe/stripe-js's loadStripe() finds it, uses it and loads nothing from the web
// (@stripe/stripe-js 10.2.1, dist/index.mjs: loadScript resolves with window.Stripe when it is set,
// then calls it as Stripe(publishableKey, options) and checks Stripe.version against its release train).
// Calls go to the REST API at the origin this script was loaded from.

import type { ReleaseTrain, StripeConstructorOptions } from '@stripe/stripe-js';
import { IntegrationError } from './integration-error';
import { createStripeClient } from './stripe-client.browser';

// Must equal @stripe/stripe-js's RELEASE_TRAIN, or loadStripe() warns about a version mismatch.
const RELEASE_TRAIN: ReleaseTrain = 'endive';

function scriptOrigin(): string {
  const script = document.currentScript;
  if (script instanceof HTMLScriptElement && script.src) return new URL(script.src).origin;
  throw new Error(
    'payments-fake: include stripe.js with <script src="http://127.0.0.1:3200/v1/stripe.js">, so it knows where the stand-in runs.',
  );
}

const apiOrigin = scriptOrigin();

function Stripe(publishableKey: unknown, options?: StripeConstructorOptions) {
  if (typeof publishableKey !== 'string' || publishableKey.trim() === '') {
    throw new IntegrationError('Stripe() needs your publishable key (pk_test_…) as its first argument.');
  }
  if (publishableKey.startsWith('sk_') || publishableKey.startsWith('rk_')) {
    throw new IntegrationError(
      'Stripe() was given a secret key. The browser takes the publishable key (pk_test_…); keep secret keys on the server.',
    );
  }
  if (!publishableKey.startsWith('pk_test_')) {
    throw new IntegrationError(
      'The payments stand-in holds test data only: Stripe() takes a pk_test_… publishable key.',
    );
  }
  if (options !== undefined && (typeof options !== 'object' || options === null)) {
    throw new IntegrationError('Stripe() options must be an object, e.g. { apiVersion } or { stripeAccount }.');
  }
  return createStripeClient(apiOrigin, publishableKey, options);
}
Stripe.version = RELEASE_TRAIN;

(window as unknown as { Stripe: unknown }).Stripe = Stripe;
