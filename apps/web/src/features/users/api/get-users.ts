import { userListSchema } from '@turnstone/contracts/users';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export const getUsers = ({ signal }: { signal?: AbortSignal } = {}) =>
  api.get('/api/v1/users', { schema: userListSchema, signal });

export function getUsersQueryOptions() {
  return queryOptions({
    queryKey: ['users', 'list', {}] as const,
    queryFn: getUsers,
    // Invites are accepted elsewhere: always read afresh when the page opens.
    staleTime: 0,
  });
}

export const useUsers = () => useQuery(getUsersQueryOptions());
