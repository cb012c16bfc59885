import { snapshotStatusSchema } from '@turnstone/contracts/uploads';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export function getSnapshotQueryOptions(id: number) {
  return queryOptions({
    queryKey: ['snapshots', 'detail', { id }] as const,
    queryFn: ({ signal }) =>
      api.get(`/api/v1/snapshots/${id}`, { schema: snapshotStatusSchema, signal }),
    // Poll while the worker has it queued; stop once it is analysed or refused.
    refetchInterval: (query) =>
      query.state.data && query.state.data.status !== 'queued' ? false : 1500,
  });
}

export function useSnapshot(id: number | null) {
  return useQuery({ ...getSnapshotQueryOptions(id ?? 0), enabled: id !== null });
}
