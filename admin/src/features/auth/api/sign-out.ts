import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { meQueryKey } from './get-me';

export async function signOut(): Promise<void> {
  await unwrap(apiClient.POST('/api/auth/sign-out'));
}

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    // Signed out locally even if the call failed: the person asked to leave.
    onSettled: () => {
      queryClient.clear();
      queryClient.setQueryData(meQueryKey, null);
    },
  });
}
