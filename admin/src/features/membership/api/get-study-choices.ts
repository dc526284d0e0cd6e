import { useQuery } from '@tanstack/react-query';
import { apiClient, unwrap } from '@/lib/api-client';

/** Every study, for choosing which one to give a staff member (admins see them all). */
export function useStudyChoices() {
  return useQuery({ queryKey: ['studies'], queryFn: () => unwrap(apiClient.GET('/api/studies')) });
}
