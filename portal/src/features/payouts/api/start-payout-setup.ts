import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { toApiError } from '@/lib/api-problem';
import type { paths } from '@evenhand/contract';
import { isWebAddress, leaveForExternalPage } from '@/lib/external-page';
import { queryKeys } from '@/lib/query-keys';

export type PayoutSetupLink = paths['/api/me/payout-account']['post']['responses'][200]['content']['application/json'];

/** Creates the payout account on first use and a fresh, single-use link to the payment service's setup page. */
export async function startPayoutSetup(): Promise<PayoutSetupLink> {
  const { data, error, response } = await api.POST('/api/me/payout-account');
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  if (!isWebAddress(data.url)) throw new Error(`url: the setup link is not a web address ("${data.url}")`);
  return data;
}

/** "Set up how you get paid": asks for a link, then leaves for the payment service's page. */
export function useStartPayoutSetup() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: startPayoutSetup,
    onSuccess: (link) => {
      queryClient.setQueryData(queryKeys.myPayoutAccount, link.account);
      leaveForExternalPage(link.url);
    },
  });
}
