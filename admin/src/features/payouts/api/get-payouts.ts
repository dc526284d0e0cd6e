import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { payoutKeys } from './payout-keys';

export type PayoutPage = components['schemas']['PayoutPageDto'];
export type Payout = components['schemas']['PayoutDto'];
export type PayoutStatus = Payout['status'];

export interface PayoutQuery {
  status: PayoutStatus | null;
  conditionId: string | null;
  page: number;
  pageSize: number;
}

export async function getPayouts(studyId: string, { status, conditionId, page, pageSize }: PayoutQuery): Promise<PayoutPage> {
  const query = { page, pageSize, ...(status ? { status } : {}), ...(conditionId ? { conditionId } : {}) };
  return unwrap(apiClient.GET('/api/studies/{studyId}/payouts', { params: { path: { studyId }, query } }));
}

// The api's PayoutQueryDto allows at most 500 a page.
const largestPage = 500;

/** Every owed payout's id (all pages), for "Approve all owed". */
export async function getOwedPayoutIds(studyId: string): Promise<string[]> {
  const ids: string[] = [];
  for (let page = 1; ; page += 1) {
    const answer = await getPayouts(studyId, { status: 'owed', conditionId: null, page, pageSize: largestPage });
    ids.push(...answer.items.map((payout) => payout.id));
    if (answer.items.length < largestPage || ids.length >= answer.total) return ids;
  }
}

export const payoutsQueryOptions = (studyId: string, query: PayoutQuery, pollEveryMs: number | false = false) =>
  queryOptions({
    queryKey: [...payoutKeys.queue(studyId), query],
    queryFn: () => getPayouts(studyId, query),
    placeholderData: keepPreviousData,
    refetchInterval: pollEveryMs,
  });

export function usePayouts(studyId: string, query: PayoutQuery, pollEveryMs: number | false = false) {
  return useQuery(payoutsQueryOptions(studyId, query, pollEveryMs));
}
