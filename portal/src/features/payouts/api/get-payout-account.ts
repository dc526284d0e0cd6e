import { queryOptions, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { toApiError } from '@/lib/api-problem';
import type { paths } from '@evenhand/contract';
import { queryKeys } from '@/lib/query-keys';

/** Where the participant's payout setup with the payment service stands. */
export type PayoutAccount = paths['/api/me/payout-account']['get']['responses'][200]['content']['application/json'];

export async function getPayoutAccount(): Promise<PayoutAccount> {
  const { data, error, response } = await api.GET('/api/me/payout-account');
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  return data;
}

export const payoutAccountQueryOptions = queryOptions({
  queryKey: queryKeys.myPayoutAccount,
  queryFn: getPayoutAccount,
});

/** How often, and how many times, to ask again after someone comes back from the payment service's page. */
export const SETUP_CHECK_INTERVAL_MS = 1_500;
export const SETUP_CHECKS = 6;

/**
 * The setup status. Coming back from the payment service, the service may tell the api a moment after the browser
 * arrives, so `waitForPayouts` asks again a few times until payouts are enabled; `checksLeft` says whether it still will.
 */
export function usePayoutAccount({ waitForPayouts = false } = {}) {
  const queryClient = useQueryClient();
  const query = useQuery({
    ...payoutAccountQueryOptions,
    // Fresh on arrival: the account changed on another site while this page was away.
    ...(waitForPayouts ? { staleTime: 0, refetchOnMount: 'always' as const } : {}),
    refetchInterval: (current) =>
      waitForPayouts && current.state.data?.payoutsEnabled !== true && current.state.dataUpdateCount < SETUP_CHECKS
        ? SETUP_CHECK_INTERVAL_MS
        : false,
  });
  // The spread reads every field, dataUpdatedAt included, so each answer re-renders, also one that changed nothing.
  const answers = queryClient.getQueryState(payoutAccountQueryOptions.queryKey)?.dataUpdateCount ?? 0;
  return { ...query, checksLeft: waitForPayouts && answers < SETUP_CHECKS };
}
