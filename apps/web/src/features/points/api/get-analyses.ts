import { analysisListSchema } from '@turnstone/contracts/points';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/** How many of a point's analyses its page lists (the snapshot picker). */
export const POINT_PAGE_ANALYSES = 200;

export interface AnalysesParams {
  pointId: number;
  limit?: number;
}

/** The point's analyses, newest first. */
export function getAnalyses(p: AnalysesParams, { signal }: { signal?: AbortSignal } = {}) {
  const qs = new URLSearchParams({ limit: String(p.limit ?? 200) });
  return api.get(`/api/v1/points/${p.pointId}/analyses?${qs}`, {
    schema: analysisListSchema,
    signal,
  });
}

export function getAnalysesQueryOptions(p: AnalysesParams) {
  return queryOptions({
    queryKey: ['analysis', 'list', p] as const,
    queryFn: ({ signal }) => getAnalyses(p, { signal }),
    refetchInterval: 60_000,
  });
}

export function useAnalyses(p: AnalysesParams) {
  return useQuery(getAnalysesQueryOptions(p));
}
