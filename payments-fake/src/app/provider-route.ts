import type { ApiKeyKind } from '../auth/api-key';
import type { ParamReader } from '../encoding/param-reader';
import type { ProviderWorld } from '../state/provider-world';

/** Who a request acts for: the platform itself, or a connected account named in Stripe-Account. */
export interface ActingAccount {
  id: string;
  isPlatform: boolean;
}

export interface ProviderCall {
  params: ParamReader;
  pathParams: Record<string, string>;
  account: ActingAccount;
  request: { id: string; idempotencyKey: string | null; apiVersion: string };
  maskedKey: string;
  keyKind: ApiKeyKind;
}

/** One endpoint of the provider's REST API; the handler returns the JSON body of a 200 answer. */
export interface ProviderRoute {
  method: 'get' | 'post' | 'delete';
  path: string;
  /** Also answers a publishable key (the few calls the browser library makes); otherwise 403. */
  publishable?: boolean;
  handle(call: ProviderCall, world: ProviderWorld): unknown;
}
