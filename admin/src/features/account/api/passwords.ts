import { useMutation } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';

// The api's rule (MIN_PASSWORD_LENGTH in api/src/users/dto/user.dto.ts), said early, in words.
export const MIN_PASSWORD_LENGTH = 12;
const newPassword = z
  .string()
  .min(MIN_PASSWORD_LENGTH, `Use at least ${MIN_PASSWORD_LENGTH} characters.`)
  .max(200, 'Use at most 200 characters.');

export const changePasswordSchema = z
  .object({
    currentPassword: z.string().min(1, 'Enter your current password.'),
    newPassword,
    repeatPassword: z.string(),
  })
  .refine((values) => values.newPassword === values.repeatPassword, {
    path: ['repeatPassword'],
    message: 'The two new passwords differ.',
  })
  .refine((values) => values.newPassword !== values.currentPassword, {
    path: ['newPassword'],
    message: 'Choose a password different from the current one.',
  });
export type ChangePasswordInput = z.infer<typeof changePasswordSchema>;

export const requestResetSchema = z.object({ email: z.email('Enter the e-mail address you sign in with.') });
export type RequestResetInput = z.infer<typeof requestResetSchema>;

export const chooseNewPasswordSchema = z
  .object({ newPassword, repeatPassword: z.string() })
  .refine((values) => values.newPassword === values.repeatPassword, {
    path: ['repeatPassword'],
    message: 'The two passwords differ.',
  });
export type ChooseNewPasswordInput = z.infer<typeof chooseNewPasswordSchema>;

export function useChangePassword() {
  return useMutation({
    mutationFn: ({ currentPassword, newPassword }: ChangePasswordInput) =>
      unwrap(apiClient.POST('/api/auth/password', { body: { currentPassword, newPassword } })),
  });
}

export function useRequestPasswordReset() {
  return useMutation({
    mutationFn: ({ email }: RequestResetInput) =>
      unwrap(apiClient.POST('/api/auth/password-reset', { body: { email } })),
  });
}

export function useConsumePasswordReset() {
  return useMutation({
    mutationFn: ({ token, newPassword }: { token: string; newPassword: string }) =>
      unwrap(apiClient.POST('/api/auth/password-reset/consume', { body: { token, newPassword } })),
  });
}
