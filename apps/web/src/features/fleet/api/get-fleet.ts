import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/** The machine tree of every site the user may see, with each node's worst status. */
export function getFleet({ signal }: { signal?: AbortSignal } = {}) {
  // The schema (and zod) load beside the request: the fleet is the first screen, and its
  // route asks for its data as soon as the session is known, before the page's code is in.
  const schema = import('@turnstone/contracts/fleet').then((m) => m.fleetSchema);
  return api.get('/api/v1/fleet', { schema, signal });
}

/**
 * The one cache entry of the fleet tree. Point pickers (limits, uploads) read it through
 * their own `select`, so every screen shares one request and one set of settings.
 */
export function getFleetQueryOptions() {
  return queryOptions({
    queryKey: ['fleet', 'list', {}] as const,
    queryFn: ({ signal }) => getFleet({ signal }),
    // Status changes as snapshots arrive; a minute is fresh enough for a tree view.
    refetchInterval: 60_000,
    staleTime: 30_000,
  });
}

export function useFleet() {
  return useQuery(getFleetQueryOptions());
}
