import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';

export const labSettingsQueryKey = ['lab-settings'] as const;

export const labSettingsQueryOptions = () =>
  queryOptions({ queryKey: labSettingsQueryKey, queryFn: () => unwrap(apiClient.GET('/api/lab-settings')) });

export function useLabSettings() {
  return useQuery(labSettingsQueryOptions());
}

export function useUpdateLabSettings() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: { twoFactorRequiredForAdmins: boolean }) =>
      unwrap(apiClient.PATCH('/api/lab-settings', { body })),
    onSuccess: (settings) => queryClient.setQueryData(labSettingsQueryKey, settings),
  });
}
