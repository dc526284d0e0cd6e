import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { toApiError } from '@/lib/api-problem';
import { replaceSignedInPerson, type Me } from './get-me';

export async function consumeSignInLink(token: string): Promise<Me> {
  const { data, error, response } = await api.POST('/api/auth/sign-in-link/consume', { body: { token } });
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  return data.user;
}

export function useConsumeSignInLink() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: consumeSignInLink,
    onSuccess: (user) => {
      replaceSignedInPerson(queryClient, user);
    },
  });
}
