import {
  apiTokenSchema,
  issuedApiTokenSchema,
  type IssueApiToken,
} from '@turnstone/contracts/api-tokens';
import {
  createdWebhookSchema,
  webhookSchema,
  type CreateWebhook,
  type WebhookEventType,
} from '@turnstone/contracts/webhooks';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import { getApiTokensQueryOptions, getWebhooksQueryOptions } from './get-integrations.ts';

export const issueApiToken = (body: IssueApiToken) =>
  api.post('/api/v1/api-tokens', { body, schema: issuedApiTokenSchema });
export const revokeApiToken = (id: number) =>
  api.post(`/api/v1/api-tokens/${id}/revoke`, { schema: apiTokenSchema });

export const createWebhook = (body: CreateWebhook) =>
  api.post('/api/v1/webhooks', { body, schema: createdWebhookSchema });
export const updateWebhook = ({
  id,
  ...body
}: {
  id: number;
  enabled?: boolean;
  events?: WebhookEventType[];
}) => api.patch(`/api/v1/webhooks/${id}`, { body, schema: webhookSchema });
export const deleteWebhook = (id: number) => api.delete(`/api/v1/webhooks/${id}`);

function useRefreshing<A, R>(fn: (a: A) => Promise<R>, queryKey: readonly unknown[]) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: () => queryClient.invalidateQueries({ queryKey }),
  });
}

export const useIssueApiToken = () =>
  useRefreshing(issueApiToken, getApiTokensQueryOptions().queryKey);
export const useRevokeApiToken = () =>
  useRefreshing(revokeApiToken, getApiTokensQueryOptions().queryKey);
export const useCreateWebhook = () =>
  useRefreshing(createWebhook, getWebhooksQueryOptions().queryKey);
export const useUpdateWebhook = () =>
  useRefreshing(updateWebhook, getWebhooksQueryOptions().queryKey);
export const useDeleteWebhook = () =>
  useRefreshing(deleteWebhook, getWebhooksQueryOptions().queryKey);
