import { mailboxListSchema, mailboxMessageSchema } from '@turnstone/contracts/mail';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export function getMailboxQueryOptions(search = '') {
  const q = search.trim();
  return queryOptions({
    queryKey: ['mailbox', 'list', { search: q }] as const,
    queryFn: ({ signal }) =>
      api.get(`/api/v1/mailbox${q ? `?search=${encodeURIComponent(q)}` : ''}`, {
        schema: mailboxListSchema,
        signal,
      }),
    placeholderData: (previous) => previous,
    // New mail arrives from the outbox every few seconds.
    refetchInterval: 5000,
  });
}
export const useMailbox = (search = '') => useQuery(getMailboxQueryOptions(search));

export function getMessageQueryOptions(id: number) {
  return queryOptions({
    queryKey: ['mailbox', 'detail', { id }] as const,
    queryFn: ({ signal }) =>
      api.get(`/api/v1/mailbox/${id}`, { schema: mailboxMessageSchema, signal }),
    staleTime: Infinity,
  });
}
export const useMessage = (id: number | null) =>
  useQuery({ ...getMessageQueryOptions(id ?? 0), enabled: id !== null });
