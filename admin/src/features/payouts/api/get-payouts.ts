import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components, operations } from '@evenhand/contract';
import { payoutKeys } from './payout-keys';

export type PayoutPage = components['schemas']['PayoutPageDto'];
export type Payout = components['schemas']['PayoutDto'];
export type PayoutStatus = Payout['status'];
export type PayoutStage = Payout['stage'];
export type PayoutSort = NonNullable<
  NonNullable<operations['StudyPayoutsController_list']['parameters']['query']>['sort']
>;
export type StageTotals = PayoutPage['stages'];

export interface PayoutQuery {
  stage?: PayoutStage | null;
  status?: PayoutStatus | null;
  conditionId?: string | null;
  enrollmentId?: string | null;
  search?: string;
  sort?: PayoutSort;
  page: number;
  pageSize: number;
}

export async function getPayouts(
  studyId: string,
  { stage, status, conditionId, enrollmentId, search, sort, page, pageSize }: PayoutQuery,
): Promise<PayoutPage> {
  const query = {
    page,
    pageSize,
    ...(stage ? { stage } : {}),
    ...(status ? { status } : {}),
    ...(conditionId ? { conditionId } : {}),
    ...(enrollmentId ? { enrollmentId } : {}),
    ...(search?.trim() ? { search: search.trim() } : {}),
    ...(sort ? { sort } : {}),
  };
  return unwrap(apiClient.GET('/api/studies/{studyId}/payouts', { params: { path: { studyId }, query } }));
}

// The api's PayoutQueryDto allows at most 500 a page.
const largestPage = 500;

/** Every payout id in one stage (all pages), e.g. for "Approve all waiting". */
export async function getPayoutIdsInStage(studyId: string, stage: PayoutStage): Promise<string[]> {
  const ids: string[] = [];
  for (let page = 1; ; page += 1) {
    const answer = await getPayouts(studyId, { stage, page, pageSize: largestPage });
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

/** One participant's payouts in this study, oldest first: their payment history. */
export function usePaymentHistory(studyId: string, enrollmentId: string | null) {
  return useQuery({
    queryKey: [...payoutKeys.queue(studyId), 'history', enrollmentId],
    queryFn: () => getPayouts(studyId, { enrollmentId, sort: 'oldest', page: 1, pageSize: largestPage }),
    enabled: enrollmentId !== null,
  });
}
