import { useMutation } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { toApiError } from '@/lib/api-problem';
import type { paths } from '@evenhand/contract';

export type SignInLinkRequest = paths['/api/auth/sign-in-link']['post']['requestBody']['content']['application/json'];

export const signInLinkFormSchema = z.object({
  email: z
    .string()
    .trim()
    .min(1, 'Enter your e-mail address.')
    .max(254, 'That e-mail address is too long.')
    .pipe(z.email('Enter an e-mail address like name@example.com.')),
});

export type SignInLinkFormValues = z.input<typeof signInLinkFormSchema>;

/** Always answers 202 whether or not the address is known, so nothing here tells anyone who has an account. */
export async function requestSignInLink(body: SignInLinkRequest): Promise<void> {
  const { error, response } = await api.POST('/api/auth/sign-in-link', { body });
  if (!response.ok) throw toApiError(error, response);
}

export function useRequestSignInLink() {
  return useMutation({ mutationFn: requestSignInLink });
}
