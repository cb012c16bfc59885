import { trendResponseSchema } from '@turnstone/contracts/trend';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export interface TrendParams {
  pointId: number;
  band: string;
  /** ISO times; the server defaults to the last 90 days. */
  from?: string;
  to?: string;
}

function query(p: TrendParams) {
  const qs = new URLSearchParams({ band: p.band });
  if (p.from) qs.set('from', p.from);
  if (p.to) qs.set('to', p.to);
  return qs.toString();
}

/** One band of a point over a period with levels, baseline, projection and markers. */
export function getTrend(p: TrendParams, { signal }: { signal?: AbortSignal } = {}) {
  return api.get(`/api/v1/points/${p.pointId}/trend?${query(p)}`, {
    schema: trendResponseSchema,
    signal,
  });
}

export function getTrendQueryOptions(p: TrendParams) {
  return queryOptions({
    queryKey: ['trend', 'detail', p] as const,
    queryFn: ({ signal }) => getTrend(p, { signal }),
    placeholderData: keepPreviousData,
    refetchInterval: 5 * 60_000,
  });
}

export function useTrend(p: TrendParams) {
  return useQuery(getTrendQueryOptions(p));
}

export const trendCsvHref = (p: TrendParams) => `/api/v1/points/${p.pointId}/trend.csv?${query(p)}`;
