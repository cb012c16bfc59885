import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import { getMeQueryOptions } from './get-me.ts';

export function signOut() {
  return api.post('/api/v1/auth/sign-out', { quiet401: true });
}

/**
 * `onSuccess` should leave the signed-in pages (it may return the navigation's promise);
 * the session is forgotten after it, so no guard mistakes the sign-out for an expired session.
 */
export function useSignOut({ onSuccess }: { onSuccess?: () => void | Promise<void> } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSuccess: async () => {
      await onSuccess?.();
      queryClient.setQueryData(getMeQueryOptions().queryKey, null);
      queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== 'me' });
    },
  });
}
