// Webhook signing as the provider publishes it (https://docs.stripe.com/webhooks#verify-manually):
// header `Stripe-Signature: t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<raw body>" keyed with the
// endpoint's signing secret>`. Pure: no framework imports.

import { createHmac } from 'node:crypto';

export const SIGNATURE_HEADER = 'Stripe-Signature';

export function computeSignature(rawBody: string, secret: string, timestampSeconds: number): string {
  return createHmac('sha256', secret).update(`${timestampSeconds}.${rawBody}`, 'utf8').digest('hex');
}

export function signatureHeaderValue(rawBody: string, secret: string, timestampSeconds: number): string {
  return `t=${timestampSeconds},v1=${computeSignature(rawBody, secret, timestampSeconds)}`;
}
