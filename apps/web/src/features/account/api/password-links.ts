import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

// Public calls: a 401 cannot happen here, and none must send anyone to sign-in.
export const useForgotPassword = () =>
  useMutation({
    mutationFn: (body: { email: string }) =>
      api.post('/api/v1/auth/forgot-password', { body, quiet401: true }),
  });

export const useSetPasswordFromLink = (kind: 'invite' | 'reset') =>
  useMutation({
    mutationFn: (body: { token: string; password: string }) =>
      api.post(kind === 'invite' ? '/api/v1/auth/accept-invite' : '/api/v1/auth/reset-password', {
        body,
        quiet401: true,
      }),
  });
