import { decodeFloat32Base64, waveformSchema } from '@turnstone/contracts/points';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, isApiError } from '../../../lib/api-client.ts';

/** The time waveform of an analysis in g (410 when retention removed the raw samples). */
export async function getWaveform(analysisId: number, { signal }: { signal?: AbortSignal } = {}) {
  const w = await api.get(`/api/v1/analyses/${analysisId}/waveform`, {
    schema: waveformSchema,
    signal,
  });
  return { ...w, decoded: decodeFloat32Base64(w.values) };
}

export function getWaveformQueryOptions(analysisId: number | null) {
  return queryOptions({
    queryKey: ['waveform', 'detail', { analysisId }] as const,
    queryFn: ({ signal }) => getWaveform(analysisId!, { signal }),
    enabled: analysisId !== null,
    staleTime: Infinity,
    retry: (count, error) => !(isApiError(error) && error.status < 500) && count < 2,
  });
}

export function useWaveform(analysisId: number | null) {
  return useQuery(getWaveformQueryOptions(analysisId));
}

export const waveformDownloadHref = (analysisId: number, format: 'wav' | 'csv') =>
  `/api/v1/analyses/${analysisId}/waveform.${format}`;
