import { undeliveredMailListSchema } from '@turnstone/contracts/mail';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export function getUndeliveredMailQueryOptions() {
  return queryOptions({
    queryKey: ['mail', 'undelivered', {}] as const,
    queryFn: ({ signal }) =>
      api.get('/api/v1/mail/undelivered', { schema: undeliveredMailListSchema, signal }),
    refetchInterval: 15_000,
  });
}
export const useUndeliveredMail = () => useQuery(getUndeliveredMailQueryOptions());

/** Puts a failed or uncertain message back in the outbox; the sender tries it again. */
export function useResendMail() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api.post(`/api/v1/mail/undelivered/${id}/resend`),
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: getUndeliveredMailQueryOptions().queryKey }),
  });
}
