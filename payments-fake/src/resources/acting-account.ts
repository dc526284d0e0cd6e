import { providerErrors } from '../errors/provider-error';
import type { ProviderCall } from '../app/provider-route';

/** Refuses a platform-only request sent on behalf of a connected account. */
export function requirePlatform(call: ProviderCall): void {
  if (!call.account.isPlatform) throw providerErrors.onlyOnPlatform();
}
