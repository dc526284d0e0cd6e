import { QueryClientProvider } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { meQueryKey } from '@/features/auth/api/get-me';
import { onSessionLost } from '@/lib/api-client';
import { createQueryClient } from '@/lib/query-client';

export function AppProvider({ children }: { children: React.ReactNode }) {
  const [queryClient] = useState(createQueryClient);

  // When a refresh fails, forget the person; the route guard then sends them to sign-in.
  useEffect(
    () =>
      onSessionLost(() => {
        queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== meQueryKey[0] });
        queryClient.setQueryData(meQueryKey, null);
      }),
    [queryClient],
  );

  return <QueryClientProvider client={queryClient}>{children}</QueryClientProvider>;
}
