import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { toApiError } from '@/lib/api-problem';
import type { paths } from '@evenhand/contract';
import { replaceSignedInPerson } from './get-me';

/** Who is now signed in, and the study page they asked for the link from (if any), to take them back there. */
export type LinkSession =
  paths['/api/auth/sign-in-link/consume']['post']['responses'][200]['content']['application/json'];

export async function consumeSignInLink(token: string): Promise<LinkSession> {
  const { data, error, response } = await api.POST('/api/auth/sign-in-link/consume', { body: { token } });
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  return data;
}

export function useConsumeSignInLink() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: consumeSignInLink,
    onSuccess: (session) => {
      replaceSignedInPerson(queryClient, session.user);
    },
  });
}
