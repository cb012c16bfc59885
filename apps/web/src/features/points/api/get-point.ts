import { pointDetailSchema } from '@turnstone/contracts/points';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/** A point with its machine, latest analysis and bands. */
export function getPoint(id: number, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`/api/v1/points/${id}`, { schema: pointDetailSchema, signal });
}

export function getPointQueryOptions(id: number) {
  return queryOptions({
    queryKey: ['point', 'detail', { id }] as const,
    queryFn: ({ signal }) => getPoint(id, { signal }),
    refetchInterval: 60_000,
  });
}

export function usePoint(id: number) {
  return useQuery(getPointQueryOptions(id));
}
