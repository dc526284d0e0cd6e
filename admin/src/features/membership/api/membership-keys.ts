import type { paths } from '@evenhand/contract';
import type { StaffRole } from '@/lib/role-access';

export type StudyMember =
  paths['/api/studies/{studyId}/members']['get']['responses'][200]['content']['application/json']['items'][number];
export type StaffStudy =
  paths['/api/staff/{userId}/studies']['get']['responses'][200]['content']['application/json']['items'][number];
export type MembershipRole = NonNullable<
  paths['/api/studies/{studyId}/members']['post']['requestBody']
>['content']['application/json']['role'];

export const studyMembersKey = (studyId: string) => ['study-members', studyId] as const;
export const staffStudiesKey = (userId: string) => ['staff-studies', userId] as const;
/** Every membership list, for invalidating both sides (a study's members and a person's studies) after a change. */
export const membershipRootKeys = [['study-members'], ['staff-studies']] as const;

const allMembershipRoles: readonly MembershipRole[] = ['coordinator', 'researcher', 'auditor'];

/**
 * The membership roles the api accepts for a person: their own staff role, or any of the three for an admin
 * (the api's rule in StudiesService.addMember).
 */
export function fittingMembershipRoles(staffRole: StaffRole): readonly MembershipRole[] {
  return staffRole === 'admin' ? allMembershipRoles : allMembershipRoles.filter((role) => role === staffRole);
}
