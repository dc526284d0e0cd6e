import { QueryClient } from '@tanstack/react-query';
import { ApiError } from './api-error';

export function createQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        refetchOnWindowFocus: false,
        // A 4xx will not change on retry; network blips and 5xx may.
        retry: (failureCount, error) =>
          !(error instanceof ApiError && error.statusCode >= 400 && error.statusCode < 500) && failureCount < 2,
      },
      mutations: { retry: false },
    },
  });
}
