import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { selectionQuery, type AuditSelection } from '../utils/audit-selection';

export type AuditPage = components['schemas']['AuditPageDto'];
export type AuditEvent = components['schemas']['AuditEventDto'];

export const auditKey = ['audit'] as const;

export async function getAuditEvents(selection: AuditSelection, page: number, pageSize: number): Promise<AuditPage> {
  return unwrap(apiClient.GET('/api/audit', { params: { query: { ...selectionQuery(selection), page, pageSize } } }));
}

export const auditEventsQueryOptions = (selection: AuditSelection, page: number, pageSize: number) =>
  queryOptions({
    queryKey: [...auditKey, 'events', selection, page, pageSize],
    queryFn: () => getAuditEvents(selection, page, pageSize),
    placeholderData: keepPreviousData,
  });

export function useAuditEvents(selection: AuditSelection, page: number, pageSize: number) {
  return useQuery(auditEventsQueryOptions(selection, page, pageSize));
}
