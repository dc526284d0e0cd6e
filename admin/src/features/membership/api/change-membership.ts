import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import { membershipRootKeys, type MembershipRole } from './membership-keys';

export interface AddMembershipInput {
  studyId: string;
  email: string;
  role: MembershipRole;
}

export async function addMembership({ studyId, email, role }: AddMembershipInput) {
  return unwrap(
    apiClient.POST('/api/studies/{studyId}/members', { params: { path: { studyId } }, body: { email, role } }),
  );
}

export async function removeMembership({ studyId, userId }: { studyId: string; userId: string }) {
  return unwrap(apiClient.DELETE('/api/studies/{studyId}/members/{userId}', { params: { path: { studyId, userId } } }));
}

function useInvalidateMemberships() {
  const queryClient = useQueryClient();
  // Both sides show the same rows: a study's members and a person's studies.
  return () => Promise.all(membershipRootKeys.map((queryKey) => queryClient.invalidateQueries({ queryKey })));
}

/** Admins only: gives a staff member a study with a membership role that fits their staff role. */
export function useAddMembership() {
  const invalidate = useInvalidateMemberships();
  return useMutation({ mutationFn: addMembership, onSuccess: invalidate });
}

/** Admins only: takes a study away from a staff member. */
export function useRemoveMembership() {
  const invalidate = useInvalidateMemberships();
  return useMutation({ mutationFn: removeMembership, onSuccess: invalidate });
}
