import { meSchema, type SignInRequest } from '@turnstone/contracts/auth';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client.ts';
import { getMeQueryOptions } from './get-me.ts';

const signInResponseSchema = z.object({ user: meSchema });

export function signIn(body: SignInRequest) {
  // quiet401: here a 401 means wrong credentials, not an ended session.
  return api.post('/api/v1/auth/sign-in', { body, schema: signInResponseSchema, quiet401: true });
}

export function useSignIn({ onSuccess }: { onSuccess?: () => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: ({ user }) => {
      // Whatever was cached belonged to the previous session.
      queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== 'me' });
      queryClient.setQueryData(getMeQueryOptions().queryKey, user);
      onSuccess?.();
    },
  });
}
