import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import { meQueryKey, type Me } from './get-me';

export const signInInputSchema = z.object({
  email: z
    .string()
    .trim()
    .min(1, 'Enter your e-mail address.')
    .pipe(z.email('Enter a valid e-mail address, like name@lab.org.')),
  password: z.string().min(1, 'Enter your password.'),
});

export type SignInInput = z.infer<typeof signInInputSchema> & { code?: string; recoveryCode?: string };

/** The second step, when the account has two-factor sign-in on: a 6-digit code, or one recovery code. */
export const secondFactorSchema = z.discriminatedUnion('kind', [
  z.object({
    kind: z.literal('code'),
    value: z
      .string()
      .trim()
      .regex(/^\d{3}\s?\d{3}$/, 'Enter the 6 digits your authenticator app shows.'),
  }),
  z.object({
    kind: z.literal('recovery-code'),
    value: z
      .string()
      .trim()
      .min(1, 'Enter one of your recovery codes.')
      .max(40, 'That is longer than a recovery code.'),
  }),
]);
export type SecondFactorInput = z.infer<typeof secondFactorSchema>;

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
