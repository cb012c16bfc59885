import {
  findingSchema,
  type FindingList,
  type UpdateFindingInput,
} from '@turnstone/contracts/findings';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export function updateFinding({ id, ...body }: UpdateFindingInput & { id: number }) {
  return api.patch(`/api/v1/findings/${id}`, { body, schema: findingSchema });
}

/**
 * Changes a finding. A plain state change shows at once (optimistic; safe because the server
 * answer replaces it, and a refusal rolls it back).
 */
export function useUpdateFinding() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateFinding,
    onMutate: async (vars) => {
      await queryClient.cancelQueries({ queryKey: ['findings', 'list'] });
      const before = queryClient.getQueriesData<FindingList>({ queryKey: ['findings', 'list'] });
      if (vars.state) {
        queryClient.setQueriesData<FindingList>({ queryKey: ['findings', 'list'] }, (old) =>
          old
            ? {
                items: old.items.map((f) =>
                  f.id === vars.id
                    ? {
                        ...f,
                        state: vars.state!,
                        ...(typeof vars.workOrderRef === 'string' && vars.workOrderRef
                          ? { workOrderRef: vars.workOrderRef }
                          : {}),
                      }
                    : f,
                ),
              }
            : old,
        );
      }
      return { before };
    },
    onError: (_error, _vars, context) => {
      for (const [key, data] of context?.before ?? []) queryClient.setQueryData(key, data);
    },
    onSettled: async () => {
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: ['findings', 'list'] }),
        queryClient.invalidateQueries({ queryKey: ['review'] }),
      ]);
    },
  });
}
