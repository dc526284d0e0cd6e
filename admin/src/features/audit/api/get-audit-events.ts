import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';

export type AuditPage = components['schemas']['AuditPageDto'];
export type AuditEvent = components['schemas']['AuditEventDto'];

export interface AuditQuery {
  /** A study id, "lab" for lab-wide events, or null for every chain. */
  chain: string | null;
  action: string | null;
  page: number;
  pageSize: number;
}

export const auditKey = ['audit'] as const;

export async function getAuditEvents({ chain, action, page, pageSize }: AuditQuery): Promise<AuditPage> {
  const query = { page, pageSize, ...(chain ? { chain } : {}), ...(action ? { action } : {}) };
  return unwrap(apiClient.GET('/api/audit', { params: { query } }));
}

export const auditEventsQueryOptions = (query: AuditQuery) =>
  queryOptions({
    queryKey: [...auditKey, 'events', query],
    queryFn: () => getAuditEvents(query),
    placeholderData: keepPreviousData,
  });

export function useAuditEvents(query: AuditQuery) {
  return useQuery(auditEventsQueryOptions(query));
}
