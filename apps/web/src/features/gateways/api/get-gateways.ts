import { gatewayListSchema } from '@turnstone/contracts/gateways';
import { siteListSchema } from '@turnstone/contracts/fleet';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export function getGateways({ signal }: { signal?: AbortSignal } = {}) {
  return api.get('/api/v1/gateways', { schema: gatewayListSchema, signal });
}

export function getGatewaysQueryOptions() {
  return queryOptions({
    queryKey: ['gateways', 'list', {}] as const,
    queryFn: ({ signal }) => getGateways({ signal }),
    // "Last seen" moves as gateways post; half a minute is fresh enough.
    refetchInterval: 30_000,
  });
}

export function useGateways() {
  return useQuery(getGatewaysQueryOptions());
}

/** Sites for the "create gateway" form. */
export function getSitesQueryOptions() {
  return queryOptions({
    queryKey: ['sites', 'list', {}] as const,
    queryFn: ({ signal }) => api.get('/api/v1/sites', { schema: siteListSchema, signal }),
  });
}

export function useSites() {
  return useQuery(getSitesQueryOptions());
}
