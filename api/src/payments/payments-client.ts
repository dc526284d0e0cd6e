import Stripe from 'stripe';
import type { AppConfig } from '../config/app-config';

/** The payment provider's official SDK, pointed wherever the configuration says. */
export function createPaymentsClient(config: AppConfig): Stripe {
  return new Stripe(config.stripeSecretKey, {
    host: config.stripeHost,
    port: config.stripePort,
    protocol: config.stripeProtocol,
    maxNetworkRetries: 2,
    timeout: 10_000,
  });
}
