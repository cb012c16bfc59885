import { alertDetailSchema } from '@turnstone/contracts/alerts';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import { ALERTS_POLL_MS } from './get-alerts.ts';

export function getAlert(id: number, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`/api/v1/alerts/${id}`, { schema: alertDetailSchema, signal });
}

export function getAlertQueryOptions(id: number) {
  return queryOptions({
    queryKey: ['alerts', 'detail', { id }] as const,
    queryFn: ({ signal }) => getAlert(id, { signal }),
    refetchInterval: ALERTS_POLL_MS,
  });
}

export function useAlert(id: number | null) {
  return useQuery({ ...getAlertQueryOptions(id ?? 0), enabled: id !== null });
}
