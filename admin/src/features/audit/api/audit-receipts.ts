import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';
import { auditKey } from './get-audit-events';

export type AuditReceiptSummary = components['schemas']['AuditReceiptSummaryDto'];

export const receiptsKey = [...auditKey, 'receipts'] as const;

export async function listAuditReceipts(): Promise<AuditReceiptSummary[]> {
  return (await unwrap(apiClient.GET('/api/audit/receipts'))).items;
}

export const auditReceiptsQueryOptions = () => queryOptions({ queryKey: receiptsKey, queryFn: listAuditReceipts });

export function useAuditReceipts() {
  return useQuery(auditReceiptsQueryOptions());
}

/** Seals every chain's head into a new receipt now; it is also e-mailed to the auditors. */
export function useSealReceipt() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => unwrap(apiClient.POST('/api/audit/receipts')),
    // The new receipt lists first, and sealing is itself an event in the lab-wide chain.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: auditKey }),
  });
}

/** Where a receipt downloads from (the api names the file audit-receipt-<number>.json). */
export const receiptHref = (id: string) => `/api/audit/receipts/${id}`;
