import { machineAttentionSchema } from '@turnstone/contracts/machine-attention';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/** Why a machine is in alert: its open alerts (danger first) and findings not done. */
export function getMachineAttention(id: number, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`/api/v1/machines/${id}/attention`, { schema: machineAttentionSchema, signal });
}

export function getMachineAttentionQueryOptions(id: number) {
  return queryOptions({
    queryKey: ['machine-attention', 'detail', { id }] as const,
    queryFn: ({ signal }) => getMachineAttention(id, { signal }),
    refetchInterval: 60_000,
  });
}

export function useMachineAttention(id: number) {
  return useQuery(getMachineAttentionQueryOptions(id));
}
