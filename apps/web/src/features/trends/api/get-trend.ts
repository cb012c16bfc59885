import { DEFAULT_TREND_DAYS, trendResponseSchema } from '@turnstone/contracts/trend';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export interface TrendParams {
  pointId: number;
  band: string;
  /** ISO times; without them the server's default period up to its clock. */
  from?: string;
  to?: string;
}

const DAY_MS = 86_400_000;

/** The band a point's trend opens on: overall velocity when the point has it. */
export function defaultTrendBand(bands: readonly { key: string }[]): string {
  return (
    bands.find((b) => b.key === 'overall-velocity')?.key ?? bands[0]?.key ?? 'overall-velocity'
  );
}

/** The period a point's trend opens on, in days: the server's default period. */
export { DEFAULT_TREND_DAYS };

/**
 * The window's end: the next whole minute, so the query key stays the same between renders
 * and between the page and a prefetch made just before it opened.
 */
export const trendAnchor = (now = Date.now()) => Math.ceil(now / 60_000) * 60_000;

/**
 * The trend query of `band` over the `days` up to `anchor`. The period a trend opens on is
 * asked without times (the server's default period, up to its clock): its address is the
 * same wherever and whenever it is made, so the server preloads it with a point's page
 * (apps/server/src/lib/index-page.ts), a prefetch on hover is found by the page whatever the
 * minute, and a point opened again finds its trend in the cache.
 */
export function trendParams(
  pointId: number,
  band: string,
  days: number,
  anchor: number,
): TrendParams {
  if (days === DEFAULT_TREND_DAYS) return { pointId, band };
  return {
    pointId,
    band,
    from: new Date(anchor - days * DAY_MS).toISOString(),
    to: new Date(anchor).toISOString(),
  };
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
