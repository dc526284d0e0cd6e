import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { toApiError } from '@/lib/api-problem';
import { replaceSignedInPerson } from './get-me';

export async function signOut(): Promise<void> {
  const { error, response } = await api.POST('/api/auth/sign-out');
  // A 401 means the session had already ended, which is what signing out wants.
  if (!response.ok && response.status !== 401) throw toApiError(error, response);
}

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSuccess: () => {
      replaceSignedInPerson(queryClient, null);
    },
  });
}
