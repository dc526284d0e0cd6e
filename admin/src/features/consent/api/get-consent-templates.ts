import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';
import type { components } from '@evenhand/contract';

export type ConsentTemplate = components['schemas']['ConsentTemplateDto'];

export const consentTemplatesKey = ['consent-templates'] as const;

export async function getConsentTemplates(): Promise<ConsentTemplate[]> {
  return (await unwrap(apiClient.GET('/api/consent-templates'))).items;
}

export const consentTemplatesQueryOptions = () =>
  // Templates ship with the api and change only with a new release.
  queryOptions({ queryKey: consentTemplatesKey, queryFn: getConsentTemplates, staleTime: 60 * 60_000 });

export function useConsentTemplates() {
  return useQuery(consentTemplatesQueryOptions());
}
