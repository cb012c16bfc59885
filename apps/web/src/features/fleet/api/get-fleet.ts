import type { Fleet } from '@turnstone/contracts/fleet';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/**
 * The machine tree of every site the user may see, with each node's worst status.
 *
 * The answer is not parsed with `fleetSchema` here: the fleet is the first screen, and a
 * parse would load zod (27 kB gzip) before its first row. The server answers from the same
 * contract, and the API contract tests check its answers against the OpenAPI document made
 * of that schema (tests/api/api-contract.test.ts).
 */
export function getFleet({ signal }: { signal?: AbortSignal } = {}): Promise<Fleet> {
  return api.get('/api/v1/fleet', { signal }) as Promise<Fleet>;
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
