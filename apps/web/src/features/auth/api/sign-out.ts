import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import { getMeQueryOptions } from './get-me.ts';

export function signOut() {
  return api.post('/api/v1/auth/sign-out', { quiet401: true });
}

export function useSignOut({ onSuccess }: { onSuccess?: () => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSuccess: () => {
      onSuccess?.();
      queryClient.setQueryData(getMeQueryOptions().queryKey, null);
      queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== 'me' });
    },
  });
}
