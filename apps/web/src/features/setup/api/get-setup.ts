import { setupTreeSchema } from '@turnstone/contracts/setup';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/** Sites, areas, machines (with bearings, gears and points) the user may set up. */
export function getSetup({ signal }: { signal?: AbortSignal } = {}) {
  return api.get('/api/v1/setup', { schema: setupTreeSchema, signal });
}

export function getSetupQueryOptions() {
  return queryOptions({
    queryKey: ['setup', 'detail', {}] as const,
    queryFn: ({ signal }) => getSetup({ signal }),
  });
}

export function useSetup() {
  return useQuery(getSetupQueryOptions());
}
