import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { toApiError } from '@/lib/api-problem';
import type { paths } from '@evenhand/contract';
import { queryKeys } from '@/lib/query-keys';

/** Every payment for the signed-in participant, with the year's paid total and the tax note. */
export type MyPayouts = paths['/api/me/payouts']['get']['responses'][200]['content']['application/json'];
export type MyPayout = MyPayouts['items'][number];
export type PayoutStatus = MyPayout['status'];

export async function getMyPayouts(): Promise<MyPayouts> {
  const { data, error, response } = await api.GET('/api/me/payouts');
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  return data;
}

export const myPayoutsQueryOptions = queryOptions({ queryKey: queryKeys.myPayouts, queryFn: getMyPayouts });

export function useMyPayouts() {
  return useQuery(myPayoutsQueryOptions);
}
