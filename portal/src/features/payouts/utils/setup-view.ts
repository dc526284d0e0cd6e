import type { PayoutAccount } from '../api/get-payout-account';

/** How the participant came back from the payment service's page, read from `?onboarding=`. */
export type SetupReturn = 'done' | 'expired' | null;

export function setupReturnFrom(search: URLSearchParams): SetupReturn {
  const onboarding = search.get('onboarding');
  return onboarding === 'done' || onboarding === 'expired' ? onboarding : null;
}

/** What the payout-setup panel shows. */
export type SetupView = 'checking' | 'expired' | 'none' | 'started' | 'being-checked' | 'ready';

/**
 * Payouts enabled wins over everything. Just back from finishing, keep checking while checks are left; an expired
 * link asks for a new one; otherwise the account's own state decides.
 */
export function setupView(account: PayoutAccount, returnedFrom: SetupReturn, checksLeft: boolean): SetupView {
  if (account.payoutsEnabled) return 'ready';
  if (returnedFrom === 'done' && checksLeft) return 'checking';
  if (returnedFrom === 'expired') return 'expired';
  if (account.onboarding === 'complete') return 'being-checked';
  return account.onboarding === 'started' || account.exists ? 'started' : 'none';
}
