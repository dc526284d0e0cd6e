import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { toApiError } from '@/lib/api-problem';
import type { paths } from '@evenhand/contract';
import { queryKeys } from '@/lib/query-keys';

/** What anyone may see about a study before signing in; only a recruiting study takes new people. */
export type PublicStudy = paths['/api/public/studies/{slug}']['get']['responses'][200]['content']['application/json'];

export async function getPublicStudy(slug: string): Promise<PublicStudy> {
  const { data, error, response } = await api.GET('/api/public/studies/{slug}', { params: { path: { slug } } });
  if (error !== undefined || data === undefined) throw toApiError(error, response);
  return data;
}

export const publicStudyQueryOptions = (slug: string) =>
  queryOptions({ queryKey: queryKeys.publicStudy(slug), queryFn: () => getPublicStudy(slug) });

export function usePublicStudy(slug: string, { enabled = true } = {}) {
  return useQuery({ ...publicStudyQueryOptions(slug), enabled });
}
