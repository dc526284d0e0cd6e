import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { auditKey } from './get-audit-events';

export type AuditFilterOptions = components['schemas']['AuditFilterOptionsDto'];

export async function getAuditFilters(): Promise<AuditFilterOptions> {
  return unwrap(apiClient.GET('/api/audit/filters'));
}

export const auditFiltersQueryOptions = () =>
  queryOptions({ queryKey: [...auditKey, 'filters'], queryFn: getAuditFilters, staleTime: 60_000 });

/** The families of action, staff members and studies the trail can be narrowed to. */
export function useAuditFilters() {
  return useQuery(auditFiltersQueryOptions());
}
