import { auditPageSchema } from '@turnstone/contracts/audit';
import { infiniteQueryOptions, useInfiniteQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export interface AuditFilters {
  entity?: string;
  entityId?: string;
  actor?: number;
  action?: string;
  /** ISO date-times with offset. */
  from?: string;
  to?: string;
}

export function getAudit(filters: AuditFilters, cursor: string | null, signal?: AbortSignal) {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(filters))
    if (v !== undefined && v !== '') params.set(k, String(v));
  params.set('limit', '50');
  if (cursor) params.set('cursor', cursor);
  return api.get(`/api/v1/audit?${params}`, { schema: auditPageSchema, signal });
}

export function getAuditQueryOptions(filters: AuditFilters) {
  return infiniteQueryOptions({
    queryKey: ['audit', 'list', filters] as const,
    queryFn: ({ pageParam, signal }) => getAudit(filters, pageParam, signal),
    initialPageParam: null as string | null,
    getNextPageParam: (last) => last.nextCursor,
  });
}

export function useAudit(filters: AuditFilters) {
  return useInfiniteQuery(getAuditQueryOptions(filters));
}
