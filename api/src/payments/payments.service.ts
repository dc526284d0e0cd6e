import { Injectable } from '@nestjs/common';
import type Stripe from 'stripe';
import { AppConfig } from '../config/app-config';
import { createPaymentsClient } from './payments-client';

@Injectable()
export class PaymentsService {
  readonly client: Stripe;

  constructor(config: AppConfig) {
    this.client = createPaymentsClient(config);
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
