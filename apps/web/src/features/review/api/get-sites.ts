import { siteListSchema } from '@turnstone/contracts/fleet';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/** The sites the user may see, for the review's site picker. */
export function getSites({ signal }: { signal?: AbortSignal } = {}) {
  return api.get('/api/v1/sites', { schema: siteListSchema, signal });
}

export function getSitesQueryOptions() {
  return queryOptions({
    queryKey: ['sites', 'list', {}] as const,
    queryFn: ({ signal }) => getSites({ signal }),
    staleTime: 5 * 60_000,
  });
}

export function useSites() {
  return useQuery(getSitesQueryOptions());
}
