import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { watchKeys } from './watch-keys';

export type AttritionAlerts = components['schemas']['AttritionAlertsDto'];

export async function getAttritionAlerts(studyId: string): Promise<AttritionAlerts> {
  return unwrap(apiClient.GET('/api/studies/{studyId}/attrition/alerts', { params: { path: { studyId } } }));
}

export const attritionAlertsQueryOptions = (studyId: string) =>
  queryOptions({ queryKey: watchKeys.alerts(studyId), queryFn: () => getAttritionAlerts(studyId) });

export function useAttritionAlerts(studyId: string) {
  return useQuery(attritionAlertsQueryOptions(studyId));
}
