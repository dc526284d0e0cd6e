import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { staffUsersKey } from './get-staff-users';

export async function getStaffUser(id: string) {
  return unwrap(apiClient.GET('/api/users/{id}', { params: { path: { id } } }));
}

// Under the list's key, so a saved edit (which invalidates the list) refreshes the page too.
export const staffUserQueryOptions = (id: string) =>
  queryOptions({ queryKey: [...staffUsersKey, 'one', id], queryFn: () => getStaffUser(id) });

export function useStaffUser(id: string) {
  return useQuery(staffUserQueryOptions(id));
}
