import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import { staffRoles } from '@/lib/role-access';
import { staffUsersKey, type StaffUser } from './get-staff-users';

/** The api's minimum for staff passwords (DESIGN: minimum length on staff sign-in). */
export const minimumPasswordLength = 12;

export const staffNameSchema = z
  .string()
  .trim()
  .min(1, 'Enter the person’s name.')
  .max(120, 'Keep the name under 120 characters.');
export const staffRoleSchema = z.enum(staffRoles, { error: 'Choose a role.' });

export const createStaffUserInputSchema = z.object({
  email: z
    .string()
    .trim()
    .min(1, 'Enter an e-mail address.')
    .pipe(z.email('Enter a valid e-mail address, like name@lab.org.')),
  name: staffNameSchema,
  role: staffRoleSchema,
  password: z.string().min(minimumPasswordLength, `Use at least ${minimumPasswordLength} characters.`),
});

export type CreateStaffUserInput = z.infer<typeof createStaffUserInputSchema>;

export async function createStaffUser(input: CreateStaffUserInput): Promise<StaffUser> {
  return unwrap(apiClient.POST('/api/users', { body: input }));
}

export function useCreateStaffUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createStaffUser,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: staffUsersKey }),
  });
}
