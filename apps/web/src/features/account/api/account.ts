import {
  subscriptionSettingsResponseSchema,
  type ChangePassword,
  type SubscriptionSettings,
} from '@turnstone/contracts/account';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

export const changePassword = (body: ChangePassword) =>
  api.post('/api/v1/account/password', { body });
export const useChangePassword = () => useMutation({ mutationFn: changePassword });

export function getSubscriptionsQueryOptions() {
  return queryOptions({
    queryKey: ['subscriptions', 'detail', {}] as const,
    queryFn: ({ signal }) =>
      api.get('/api/v1/account/subscriptions', {
        schema: subscriptionSettingsResponseSchema,
        signal,
      }),
  });
}
export const useSubscriptions = () => useQuery(getSubscriptionsQueryOptions());

export function useSaveSubscriptions() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: SubscriptionSettings) =>
      api.put('/api/v1/account/subscriptions', {
        body,
        schema: subscriptionSettingsResponseSchema,
      }),
    onSuccess: (data) => queryClient.setQueryData(getSubscriptionsQueryOptions().queryKey, data),
  });
}
