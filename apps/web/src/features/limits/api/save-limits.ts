import {
  limitTemplateResponseSchema,
  replayResponseSchema,
  saveLimitSetResponseSchema,
  type BandDefinitionInput,
} from '@turnstone/contracts/limits';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import { getLimitHistoryQueryOptions, getLimitsQueryOptions } from './get-limit-set.ts';
import { getLimitTemplateQueryOptions } from './get-limits.ts';

/** What the editor saves to: a point's own set, or a machine type's template. */
export type LimitsTarget =
  { kind: 'point'; pointId: number } | { kind: 'template'; machineType: string };

/** Saves the bands with a reason to the point or the template (both audited). */
export function useSaveLimitsTarget(target: LimitsTarget) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (body: {
      bands: BandDefinitionInput[];
      reason: string;
    }): Promise<{ version: number; clearedAlertIds: number[] }> => {
      if (target.kind === 'point')
        return api.put(`/api/v1/points/${target.pointId}/limits`, {
          body,
          schema: saveLimitSetResponseSchema,
        });
      const out = await api.put(`/api/v1/limit-templates/${target.machineType}`, {
        body,
        schema: limitTemplateResponseSchema,
      });
      return { version: out.version, clearedAlertIds: [] };
    },
    onSuccess: () =>
      target.kind === 'point'
        ? Promise.all([
            queryClient.invalidateQueries({
              queryKey: getLimitsQueryOptions(target.pointId).queryKey,
            }),
            queryClient.invalidateQueries({
              queryKey: getLimitHistoryQueryOptions(target.pointId).queryKey,
            }),
            queryClient.invalidateQueries({ queryKey: ['alerts'] }),
          ])
        : queryClient.invalidateQueries({
            queryKey: getLimitTemplateQueryOptions(target.machineType).queryKey,
          }),
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
