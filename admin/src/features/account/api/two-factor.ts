import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';

export const twoFactorQueryKey = ['auth', 'two-factor'] as const;

export const twoFactorQueryOptions = () =>
  queryOptions({ queryKey: twoFactorQueryKey, queryFn: () => unwrap(apiClient.GET('/api/auth/two-factor')) });

export function useTwoFactorStatus() {
  return useQuery(twoFactorQueryOptions());
}

export const confirmCodeSchema = z.object({
  code: z
    .string()
    .trim()
    .regex(/^\d{3}\s?\d{3}$/, 'Enter the 6 digits your authenticator app shows.'),
});
export type ConfirmCodeInput = z.infer<typeof confirmCodeSchema>;

export const passwordCheckSchema = z.object({ password: z.string().min(1, 'Enter your password.') });
export type PasswordCheckInput = z.infer<typeof passwordCheckSchema>;

/**
 * After a change the status and the signed-in person (who may no longer be held to set-up) are read again. New
 * recovery codes are shown first: the read happens when the person says they have saved them, since reading at once
 * would replace the form (and its answer) before the codes are on screen.
 */
export function useRefreshTwoFactor() {
  const queryClient = useQueryClient();
  return () =>
    Promise.all([
      queryClient.invalidateQueries({ queryKey: twoFactorQueryKey }),
      queryClient.invalidateQueries({ queryKey: ['auth', 'me'] }),
    ]);
}

export function useBeginTwoFactorSetup() {
  return useMutation({ mutationFn: () => unwrap(apiClient.POST('/api/auth/two-factor/setup')) });
}

export function useConfirmTwoFactor() {
  return useMutation({
    mutationFn: ({ code }: ConfirmCodeInput) =>
      unwrap(apiClient.POST('/api/auth/two-factor/confirm', { body: { code: code.replace(/\s+/g, '') } })),
  });
}

export function useRenewRecoveryCodes() {
  return useMutation({
    mutationFn: ({ password }: PasswordCheckInput) =>
      unwrap(apiClient.POST('/api/auth/two-factor/recovery-codes', { body: { password } })),
  });
}

export function useTurnOffTwoFactor() {
  const refresh = useRefreshTwoFactor();
  return useMutation({
    mutationFn: ({ password }: PasswordCheckInput) =>
      unwrap(apiClient.DELETE('/api/auth/two-factor', { body: { password } })),
    onSuccess: refresh,
  });
}
