import {
  replayResponseSchema,
  saveLimitSetResponseSchema,
  type BandDefinitionInput,
} from '@turnstone/contracts/limits';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import { getLimitHistoryQueryOptions, getLimitsQueryOptions } from './get-limits.ts';

export function useSaveLimits(pointId: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: { bands: BandDefinitionInput[]; reason: string }) =>
      api.put(`/api/v1/points/${pointId}/limits`, { body, schema: saveLimitSetResponseSchema }),
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: getLimitsQueryOptions(pointId).queryKey }),
        queryClient.invalidateQueries({ queryKey: getLimitHistoryQueryOptions(pointId).queryKey }),
        queryClient.invalidateQueries({ queryKey: ['alerts'] }),
      ]),
  });
}

export function useReplayLimits(pointId: number) {
  return useMutation({
    mutationFn: (bands: BandDefinitionInput[]) =>
      api.post(`/api/v1/points/${pointId}/limits/replay`, {
        body: { bands },
        schema: replayResponseSchema,
      }),
  });
}
