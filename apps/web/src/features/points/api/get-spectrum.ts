import {
  decodeFloat32Base64,
  spectrumSchema,
  type SpectrumKind,
} from '@turnstone/contracts/points';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/** A stored spectrum with its values decoded from base64 float32. */
export async function getSpectrum(
  analysisId: number,
  kind: SpectrumKind,
  { signal }: { signal?: AbortSignal } = {},
) {
  const s = await api.get(`/api/v1/analyses/${analysisId}/spectrum?kind=${kind}`, {
    schema: spectrumSchema,
    signal,
  });
  return { ...s, decoded: decodeFloat32Base64(s.values) };
}

export function getSpectrumQueryOptions(analysisId: number | null, kind: SpectrumKind) {
  return queryOptions({
    queryKey: ['spectrum', 'detail', { analysisId, kind }] as const,
    queryFn: ({ signal }) => getSpectrum(analysisId!, kind, { signal }),
    enabled: analysisId !== null,
    // A stored spectrum never changes.
    staleTime: Infinity,
  });
}

export function useSpectrum(analysisId: number | null, kind: SpectrumKind) {
  return useQuery(getSpectrumQueryOptions(analysisId, kind));
}
