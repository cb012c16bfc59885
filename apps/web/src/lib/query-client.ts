import { QueryClient } from '@tanstack/react-query';
import { isApiError } from './api-client.ts';

/** Client errors (4xx) will not change by asking again; network and 5xx errors may. */
function shouldRetry(failureCount: number, error: unknown): boolean {
  if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
  return failureCount < 2;
}

export const queryClient = new QueryClient({
  defaultOptions: {
    queries: {
      staleTime: 30_000,
      retry: shouldRetry,
    },
    mutations: {
      retry: false,
    },
  },
});
