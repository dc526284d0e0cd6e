import { hashKey, type QueryClient, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { toApiError } from '@/lib/api-problem';
import type { paths } from '@evenhand/contract';

/** The signed-in person (participant or staff). */
export type Me = paths['/api/auth/me']['get']['responses'][200]['content']['application/json'];

export const meQueryKey = ['auth', 'me'] as const;
const meQueryHash = hashKey(meQueryKey);

/** The signed-in person, or null when there is no session (after one refresh attempt by the client). */
export async function getMe(): Promise<Me | null> {
  const { data, error, response } = await api.GET('/api/auth/me');
  if (response.status === 401) return null;
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  return data;
}

export const meQueryOptions = queryOptions({ queryKey: meQueryKey, queryFn: getMe, staleTime: 5 * 60_000 });

export function useMe() {
  return useQuery(meQueryOptions);
}

/** Sets who is signed in and drops every other cached answer, which belonged to whoever was signed in before. */
export function replaceSignedInPerson(queryClient: QueryClient, person: Me | null): void {
  queryClient.removeQueries({ predicate: (query) => query.queryHash !== meQueryHash });
  queryClient.setQueryData(meQueryKey, person);
}
