import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { studyKeys } from '@/lib/study-keys';

export type ReminderPlan = components['schemas']['ReminderPlanDto'];
export type ReminderRule = components['schemas']['ReminderRuleDto'];

export async function getReminderPlan(studyId: string): Promise<ReminderPlan> {
  return unwrap(apiClient.GET('/api/studies/{studyId}/reminder-plan', { params: { path: { studyId } } }));
}

export const reminderPlanQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: studyKeys.reminderPlan(studyId), queryFn: () => getReminderPlan(studyId) });

export function useReminderPlan(studyId: string) {
  return useQuery(reminderPlanQueryOptions(studyId));
}
