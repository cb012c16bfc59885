import {
  preferencesSchema,
  subscriptionSettingsResponseSchema,
  type ChangePassword,
  type Preferences,
  type SubscriptionSettings,
} from '@turnstone/contracts/account';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import { getMeQueryOptions } from '../../auth/api/get-me.ts';

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

/**
 * Saves the unit system and puts it into the signed-in user's record, so every screen shows
 * its values in the new units at once.
 */
export function useSavePreferences() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: Preferences) =>
      api.put('/api/v1/account/preferences', { body, schema: preferencesSchema }),
    onSuccess: (data) => {
      queryClient.setQueryData(getMeQueryOptions().queryKey, (me) =>
        me ? { ...me, unitSystem: data.unitSystem } : me,
      );
      // Server-rendered texts (alert sentences, CSV links) follow on their next fetch.
      void queryClient.invalidateQueries();
    },
  });
}
