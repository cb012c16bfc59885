/**
 * A point's limit set and its history. The schemas load beside the request (zod is not in
 * this module), so the route's prefetch imports it with the shell and asks for the limit set
 * the moment the limits screen is opened, while the screen's code is still on its way.
 */
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

const schemas = () => import('@turnstone/contracts/limits');

export function getLimitsQueryOptions(pointId: number) {
  return queryOptions({
    queryKey: ['limits', 'detail', { pointId }] as const,
    queryFn: ({ signal }) =>
      api.get(`/api/v1/points/${pointId}/limits`, {
        schema: schemas().then((m) => m.limitSetResponseSchema),
        signal,
      }),
  });
}

export function useLimits(pointId: number | null) {
  return useQuery({ ...getLimitsQueryOptions(pointId ?? 0), enabled: pointId !== null });
}

export function getLimitHistoryQueryOptions(pointId: number) {
  return queryOptions({
    queryKey: ['limit-history', 'list', { pointId }] as const,
    queryFn: ({ signal }) =>
      api.get(`/api/v1/points/${pointId}/limits/history`, {
        schema: schemas().then((m) => m.limitHistoryResponseSchema),
        signal,
      }),
  });
}

export function useLimitHistory(pointId: number) {
  return useQuery(getLimitHistoryQueryOptions(pointId));
}
