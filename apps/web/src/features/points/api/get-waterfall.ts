import { decodeFloat32Base64, type SpectrumKind } from '@turnstone/contracts/points';
import { waterfallSchema } from '@turnstone/contracts/waterfall';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/** The last `limit` spectra of a point, newest first, decoded. */
export async function getWaterfall(
  pointId: number,
  kind: SpectrumKind,
  limit: number,
  { signal }: { signal?: AbortSignal } = {},
) {
  const w = await api.get(`/api/v1/points/${pointId}/waterfall?kind=${kind}&limit=${limit}`, {
    schema: waterfallSchema,
    signal,
  });
  return { ...w, items: w.items.map((i) => ({ ...i, decoded: decodeFloat32Base64(i.values) })) };
}

export function getWaterfallQueryOptions(pointId: number, kind: SpectrumKind, limit: number) {
  return queryOptions({
    queryKey: ['waterfall', 'list', { pointId, kind, limit }] as const,
    queryFn: ({ signal }) => getWaterfall(pointId, kind, limit, { signal }),
  });
}

export function useWaterfall(pointId: number, kind: SpectrumKind, limit: number) {
  return useQuery(getWaterfallQueryOptions(pointId, kind, limit));
}
