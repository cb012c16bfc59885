import { apiTokenListSchema } from '@turnstone/contracts/api-tokens';
import { webhookDeliveryListSchema, webhookListSchema } from '@turnstone/contracts/webhooks';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export const getApiTokens = ({ signal }: { signal?: AbortSignal } = {}) =>
  api.get('/api/v1/api-tokens', { schema: apiTokenListSchema, signal });

export function getApiTokensQueryOptions() {
  return queryOptions({
    queryKey: ['api-tokens', 'list', {}] as const,
    queryFn: getApiTokens,
    // Last use changes without this screen: read afresh when it opens.
    staleTime: 0,
  });
}
export const useApiTokens = () => useQuery(getApiTokensQueryOptions());

export const getWebhooks = ({ signal }: { signal?: AbortSignal } = {}) =>
  api.get('/api/v1/webhooks', { schema: webhookListSchema, signal });

export function getWebhooksQueryOptions() {
  return queryOptions({
    queryKey: ['webhooks', 'list', {}] as const,
    queryFn: getWebhooks,
    staleTime: 0,
  });
}
export const useWebhooks = () => useQuery(getWebhooksQueryOptions());

export function getWebhookDeliveriesQueryOptions(id: number) {
  return queryOptions({
    queryKey: ['webhooks', 'detail', { id, deliveries: true }] as const,
    queryFn: ({ signal }) =>
      api.get(`/api/v1/webhooks/${id}/deliveries`, { schema: webhookDeliveryListSchema, signal }),
    staleTime: 0,
  });
}
export const useWebhookDeliveries = (id: number) => useQuery(getWebhookDeliveriesQueryOptions(id));
