import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { apiClient, unwrap } from '@/lib/api-client';
import type { paths } from '@evenhand/contract';
import { staffNameSchema, staffRoleSchema } from './create-staff-user';
import { staffUsersKey, type StaffUser } from './get-staff-users';

export const updateStaffUserInputSchema = z.object({
  name: staffNameSchema,
  role: staffRoleSchema,
});

export type UpdateStaffUserInput = z.infer<typeof updateStaffUserInputSchema>;
export type StaffUserChanges = NonNullable<
  paths['/api/users/{id}']['patch']['requestBody']
>['content']['application/json'];

export async function updateStaffUser(id: string, changes: StaffUserChanges): Promise<StaffUser> {
  return unwrap(apiClient.PATCH('/api/users/{id}', { params: { path: { id } }, body: changes }));
}

/** Saves a name/role edit or an activation change; the list refreshes either way. */
export function useUpdateStaffUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, changes }: { id: string; changes: StaffUserChanges }) => updateStaffUser(id, changes),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: staffUsersKey }),
  });
}
