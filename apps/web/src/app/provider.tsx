import { QueryClientProvider } from '@tanstack/react-query';
import { useEffect, type ReactNode } from 'react';
import { getMeQueryOptions } from '../features/auth/api/get-me.ts';
import { setUnauthenticatedHandler } from '../lib/api-client.ts';
import { queryClient } from '../lib/query-client.ts';

export function AppProvider({ children }: { children: ReactNode }) {
  // Any 401 means the session is gone: forget the user, and the signed-in layout sends
  // them to sign-in with the current page as the place to return to.
  useEffect(
    () =>
      setUnauthenticatedHandler(() => {
        queryClient.setQueryData(getMeQueryOptions().queryKey, null);
      }),
    [],
  );
  return <QueryClientProvider client={queryClient}>{children}</QueryClientProvider>;
}
