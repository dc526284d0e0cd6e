import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { payoutKeys } from './payout-keys';

export type Budget = components['schemas']['BudgetDto'];

export async function getBudget(studyId: string): Promise<Budget> {
  return unwrap(apiClient.GET('/api/studies/{studyId}/budget', { params: { path: { studyId } } }));
}

export const budgetQueryOptions = (studyId: string, pollEveryMs: number | false = false) =>
  queryOptions({
    queryKey: payoutKeys.budget(studyId),
    queryFn: () => getBudget(studyId),
    refetchInterval: pollEveryMs,
  });

export function useBudget(studyId: string, pollEveryMs: number | false = false) {
  return useQuery(budgetQueryOptions(studyId, pollEveryMs));
}
