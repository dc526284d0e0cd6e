import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { staffStudiesKey } from './membership-keys';

export async function getStaffStudies(userId: string) {
  return unwrap(apiClient.GET('/api/staff/{userId}/studies', { params: { path: { userId } } }));
}

export const staffStudiesQueryOptions = (userId: string) =>
  queryOptions({ queryKey: staffStudiesKey(userId), queryFn: () => getStaffStudies(userId) });

export function useStaffStudies(userId: string) {
  return useQuery(staffStudiesQueryOptions(userId));
}
