import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import { meQueryKey, type Me } from './get-me';

export const signInInputSchema = z.object({
  email: z.string().trim().min(1, 'Enter your e-mail address.').pipe(z.email('Enter a valid e-mail address, like name@lab.org.')),
  password: z.string().min(1, 'Enter your password.'),
});

export type SignInInput = z.infer<typeof signInInputSchema>;

export async function signIn(input: SignInInput): Promise<Me> {
  const session = await unwrap(apiClient.POST('/api/auth/sign-in', { body: input }));
  return session.user;
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (user) => {
      // A different person may be signing in on this browser: drop everything cached for the last one.
      queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== meQueryKey[0] });
      queryClient.setQueryData(meQueryKey, user);
    },
  });
}
