import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';

/** Active staff whose name or e-mail matches, for choosing whom to add to a study (admins only). */
export function useStaffChoices(search: string) {
  return useQuery({
    queryKey: ['staff-users', 'choices', search],
    queryFn: async () => {
      const page = await unwrap(
        apiClient.GET('/api/users', { params: { query: { page: 1, pageSize: 50, ...(search ? { search } : {}) } } }),
      );
      return { items: page.items.filter((user) => user.active && user.role !== 'participant'), total: page.total };
    },
    placeholderData: keepPreviousData,
  });
}
