import { retentionPolicySchema } from '@turnstone/contracts/retention';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export function getRetentionQueryOptions() {
  return queryOptions({
    queryKey: ['retention', 'policy'] as const,
    queryFn: ({ signal }) =>
      api.get('/api/v1/retention', { schema: retentionPolicySchema, signal }),
    // Set by the server's configuration: it changes only with a restart.
    staleTime: Infinity,
  });
}

export function useRetentionPolicy() {
  return useQuery(getRetentionQueryOptions());
}
