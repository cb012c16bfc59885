import { useMutation, useMutationState } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

// Public calls: a 401 cannot happen here, and none must send anyone to sign-in.
const forgotPasswordKey = ['password-link', 'forgot'] as const;

export const useForgotPassword = () =>
  useMutation({
    mutationKey: forgotPasswordKey,
    mutationFn: (body: { email: string }) =>
      api.post('/api/v1/auth/forgot-password', { body, quiet401: true }),
  });

/**
 * The address of the last accepted request, read from the mutation cache, so the answer
 * stays on screen even when the form was remounted while the request ran (a callback of
 * `mutate` would be dropped then).
 */
export function useForgotPasswordSentTo(): string | null {
  const sent = useMutationState({
    filters: { mutationKey: forgotPasswordKey, status: 'success' },
    select: (m) => (m.state.variables as { email: string } | undefined)?.email ?? null,
  });
  return sent.at(-1) ?? null;
}

export const useSetPasswordFromLink = (kind: 'invite' | 'reset') =>
  useMutation({
    mutationFn: (body: { token: string; password: string }) =>
      api.post(kind === 'invite' ? '/api/v1/auth/accept-invite' : '/api/v1/auth/reset-password', {
        body,
        quiet401: true,
      }),
  });
