import { qualityNoticeListSchema } from '@turnstone/contracts/quality';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/** A point's quality notices, newest first, with who reviewed each and when. */
export function getQualityNotices(pointId: number, { signal }: { signal?: AbortSignal } = {}) {
  const qs = new URLSearchParams({ pointId: String(pointId), limit: '10' });
  return api.get(`/api/v1/quality-notices?${qs}`, { schema: qualityNoticeListSchema, signal });
}

export function getQualityNoticesQueryOptions(pointId: number) {
  return queryOptions({
    queryKey: ['quality-notices', { pointId }] as const,
    queryFn: ({ signal }) => getQualityNotices(pointId, { signal }),
    refetchInterval: 60_000,
  });
}

export function useQualityNotices(pointId: number) {
  return useQuery(getQualityNoticesQueryOptions(pointId));
}
