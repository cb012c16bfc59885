import { findingListSchema, type FindingState } from '@turnstone/contracts/findings';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export interface FindingsParams {
  state?: FindingState | undefined;
  pointId?: number | undefined;
  siteId?: number | undefined;
  /** Due in this ISO week, `2026-W49`. */
  dueWeek?: string | undefined;
}

export function getFindings(p: FindingsParams, { signal }: { signal?: AbortSignal } = {}) {
  const q = new URLSearchParams();
  if (p.state) q.set('state', p.state);
  if (p.pointId !== undefined) q.set('pointId', String(p.pointId));
  if (p.siteId !== undefined) q.set('siteId', String(p.siteId));
  if (p.dueWeek) q.set('dueWeek', p.dueWeek);
  const search = q.toString();
  return api.get(`/api/v1/findings${search ? `?${search}` : ''}`, {
    schema: findingListSchema,
    signal,
  });
}

export function getFindingsQueryOptions(p: FindingsParams = {}) {
  return queryOptions({
    queryKey: ['findings', 'list', p] as const,
    queryFn: ({ signal }) => getFindings(p, { signal }),
  });
}

export function useFindings(p: FindingsParams = {}) {
  return useQuery(getFindingsQueryOptions(p));
}
