import { Injectable } from '@nestjs/common';
import type Stripe from 'stripe';
import { PaymentException } from './payment.exception';
import { AppConfig } from '../config/app-config';
import { createPaymentsClient } from './payments-client';
import { isProviderUnavailable } from './provider-failure';

@Injectable()
export class PaymentsService {
  readonly client: Stripe;

  constructor(config: AppConfig) {
    this.client = createPaymentsClient(config);
  }

  /**
   * Runs a provider call made while answering a person: when the provider is down, they get a clear 503
   * (PROVIDER_UNAVAILABLE) saying nothing was done, instead of a 500. Refusals pass through unchanged.
   */
  async call<T>(what: string, request: (client: Stripe) => Promise<T>): Promise<T> {
    try {
      return await request(this.client);
    } catch (error) {
      if (isProviderUnavailable(error)) {
        throw new PaymentException(
          'PROVIDER_UNAVAILABLE',
          `The payment provider is not answering right now, so ${what} did not happen. Nothing was charged or changed; try again in a few minutes.`,
        );
      }
      throw error;
    }
  }

  /** Whether the provider answers an authenticated call right now. */
  async isReachable(): Promise<boolean> {
    try {
      await this.client.balance.retrieve(undefined, { timeout: 2000, maxNetworkRetries: 0 });
      return true;
    } catch {
      return false;
    }
  }
}
