import { machineDetailSchema } from '@turnstone/contracts/points';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/** Machine data, fault frequencies at nominal speed, and its points with latest values. */
export function getMachine(id: number, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`/api/v1/machines/${id}`, { schema: machineDetailSchema, signal });
}

export function getMachineQueryOptions(id: number) {
  return queryOptions({
    queryKey: ['machine', 'detail', { id }] as const,
    queryFn: ({ signal }) => getMachine(id, { signal }),
    refetchInterval: 60_000,
  });
}

export function useMachine(id: number) {
  return useQuery(getMachineQueryOptions(id));
}
