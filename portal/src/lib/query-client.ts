import { QueryClient } from '@tanstack/react-query';
import { isApiError } from './api-problem';

export function createQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        // A 4xx will not change by asking again; network trouble or a 5xx might.
        retry: (failureCount, error) => failureCount < 2 && !(isApiError(error) && error.statusCode < 500),
      },
      mutations: { retry: false },
    },
  });
}
