import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { paths } from '@evenhand/contract';

export type StaffUserPage = paths['/api/users']['get']['responses'][200]['content']['application/json'];
export type StaffUser = StaffUserPage['items'][number];

export interface StaffUserQuery {
  search: string;
  page: number;
  pageSize: number;
}

export const staffUsersKey = ['staff-users'] as const;

export async function getStaffUsers({ search, page, pageSize }: StaffUserQuery): Promise<StaffUserPage> {
  const query = { page, pageSize, ...(search ? { search } : {}) };
  return unwrap(apiClient.GET('/api/users', { params: { query } }));
}

export const staffUsersQueryOptions = (query: StaffUserQuery) =>
  queryOptions({
    queryKey: [...staffUsersKey, query],
    queryFn: () => getStaffUsers(query),
    // Keep the current rows on screen while the next search or page loads.
    placeholderData: keepPreviousData,
  });

export function useStaffUsers(query: StaffUserQuery) {
  return useQuery(staffUsersQueryOptions(query));
}
