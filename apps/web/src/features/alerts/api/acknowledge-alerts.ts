import {
  acknowledgeResponseSchema,
  type AcknowledgeManyRequest,
  type AlertList,
} from '@turnstone/contracts/alerts';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export function acknowledgeAlerts(body: AcknowledgeManyRequest) {
  return api.post('/api/v1/alerts/acknowledge', { body, schema: acknowledgeResponseSchema });
}

/**
 * Acknowledges the selected alerts. Optimistic: the rows show "Acknowledged" at once and go
 * back if the server refuses (e.g. 409 when another operator was quicker).
 */
export function useAcknowledgeAlerts({
  userName,
  onAcknowledged,
}: {
  userName: string;
  /** Called with how many were acknowledged; runs even if the form has gone by then. */
  onAcknowledged?: (count: number) => void;
}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: acknowledgeAlerts,
    onMutate: async ({ ids, note }) => {
      await queryClient.cancelQueries({ queryKey: ['alerts'] });
      const previous = queryClient.getQueriesData<AlertList>({ queryKey: ['alerts', 'list'] });
      const now = new Date().toISOString();
      const chosen = new Set(ids);
      queryClient.setQueriesData<AlertList>({ queryKey: ['alerts', 'list'] }, (old) =>
        old
          ? {
              items: old.items.map((a) =>
                chosen.has(a.id) && a.state === 'raised'
                  ? {
                      ...a,
                      state: 'acknowledged',
                      acknowledgedBy: userName,
                      acknowledgedAt: now,
                      acknowledgeNote: note,
                    }
                  : a,
              ),
            }
          : old,
      );
      return { previous };
    },
    onError: (_error, _vars, context) => {
      for (const [key, data] of context?.previous ?? []) queryClient.setQueryData(key, data);
    },
    onSuccess: (out) => onAcknowledged?.(out.items.length),
    onSettled: () => queryClient.invalidateQueries({ queryKey: ['alerts'] }),
  });
}
