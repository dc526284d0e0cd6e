import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { payoutKeys } from './payout-keys';

/** Queues a failed payout again; the api re-checks the funded balance first. */
export async function retryPayout(payoutId: string): Promise<void> {
  await unwrap(apiClient.POST('/api/payouts/{payoutId}/retry', { params: { path: { payoutId } } }));
}

export function useRetryPayout(studyId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: retryPayout,
    onSettled: () => queryClient.invalidateQueries({ queryKey: payoutKeys.all(studyId) }),
  });
}
