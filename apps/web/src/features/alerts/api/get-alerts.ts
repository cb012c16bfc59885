import { alertListSchema, type AlertListQuery } from '@turnstone/contracts/alerts';
import { siteListSchema } from '@turnstone/contracts/fleet';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export type AlertFilters = Pick<AlertListQuery, 'state' | 'level' | 'siteId'>;

export type AlertStateFilter = 'open' | 'raised' | 'acknowledged' | 'cleared' | 'all';

/** The list's filters as the address holds them (?state=&level=&site=); default open alerts. */
export function alertFiltersFromSearch(params: URLSearchParams): {
  stateFilter: AlertStateFilter;
  filters: AlertFilters;
} {
  const stateFilter = (params.get('state') as AlertStateFilter | null) ?? 'open';
  const level = params.get('level') as AlertFilters['level'] | null;
  const siteId = Number(params.get('site')) || undefined;
  return {
    stateFilter,
    filters: {
      ...(stateFilter !== 'open' && stateFilter !== 'all' ? { state: stateFilter } : {}),
      ...(level ? { level } : {}),
      ...(siteId ? { siteId } : {}),
    },
  };
}

/** How often the list is fetched again while the page is open, for a real-time feel. */
export const ALERTS_POLL_MS = 15_000;

export function getAlerts(filters: AlertFilters, { signal }: { signal?: AbortSignal } = {}) {
  const params = new URLSearchParams();
  if (filters.state) params.set('state', filters.state);
  if (filters.level) params.set('level', filters.level);
  if (filters.siteId) params.set('siteId', String(filters.siteId));
  const qs = params.toString();
  return api.get(`/api/v1/alerts${qs ? `?${qs}` : ''}`, { schema: alertListSchema, signal });
}

export function getAlertsQueryOptions(filters: AlertFilters) {
  return queryOptions({
    queryKey: ['alerts', 'list', filters] as const,
    queryFn: ({ signal }) => getAlerts(filters, { signal }),
    refetchInterval: ALERTS_POLL_MS,
    // Another filter keeps the list on screen (dimmed) until its answer comes, instead of
    // a loading panel in its place.
    placeholderData: keepPreviousData,
  });
}

export function useAlerts(filters: AlertFilters) {
  return useQuery(getAlertsQueryOptions(filters));
}

/** The sites the user may see, for the site filter. */
export function getSitesQueryOptions() {
  return queryOptions({
    queryKey: ['sites', 'list', {}] as const,
    queryFn: ({ signal }) => api.get('/api/v1/sites', { schema: siteListSchema, signal }),
    staleTime: 5 * 60_000,
  });
}

export function useSites() {
  return useQuery(getSitesQueryOptions());
}
