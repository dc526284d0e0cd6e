import { QueryClientProvider, type QueryClient } from '@tanstack/react-query';
import { useEffect, useState, type ReactNode } from 'react';
import { replaceSignedInPerson } from '@/features/auth/api/get-me';
import { onSessionExpired } from '@/lib/api-client';
import { createQueryClient } from '@/lib/query-client';

export function AppProvider({ children, queryClient }: { children: ReactNode; queryClient?: QueryClient }) {
  const [client] = useState(() => queryClient ?? createQueryClient());

  // When a refresh could not renew the session, forget the person; the route guard then sends them to sign in.
  useEffect(() => onSessionExpired(() => replaceSignedInPerson(client, null)), [client]);

  return <QueryClientProvider client={client}>{children}</QueryClientProvider>;
}
