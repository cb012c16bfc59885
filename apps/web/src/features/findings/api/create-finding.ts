import { findingSchema, type CreateFindingInput } from '@turnstone/contracts/findings';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export function createFinding(body: CreateFindingInput) {
  return api.post('/api/v1/findings', { body, schema: findingSchema });
}

export function useCreateFinding({ onSuccess }: { onSuccess?: () => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createFinding,
    onSuccess: async () => {
      onSuccess?.();
      // Lists of findings, and the review's "findings due", now include it.
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: ['findings', 'list'] }),
        queryClient.invalidateQueries({ queryKey: ['review'] }),
      ]);
    },
  });
}
