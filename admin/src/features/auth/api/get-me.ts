import { queryOptions, useQuery } from '@tanstack/react-query';
import { ApiError } from '@/lib/api-error';
import { apiClient, unwrap } from '@/lib/api-client';
import type { paths } from '@evenhand/contract';

export type Me = paths['/api/auth/me']['get']['responses'][200]['content']['application/json'];

export const meQueryKey = ['auth', 'me'] as const;

/** The signed-in person, or null when there is no session (after one refresh attempt). */
export async function getMe(): Promise<Me | null> {
  try {
    return await unwrap(apiClient.GET('/api/auth/me'));
  } catch (error) {
    if (error instanceof ApiError && error.statusCode === 401) return null;
    throw error;
  }
}

export const meQueryOptions = () =>
  queryOptions({
    queryKey: meQueryKey,
    queryFn: getMe,
    staleTime: 5 * 60_000,
  });

export function useMe() {
  return useQuery(meQueryOptions());
}
