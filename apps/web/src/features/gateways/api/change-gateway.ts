import {
  gatewayKeySchema,
  gatewaySchema,
  type CreateGatewayInput,
} from '@turnstone/contracts/gateways';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import { getGatewaysQueryOptions } from './get-gateways.ts';

export const createGateway = (body: CreateGatewayInput) =>
  api.post('/api/v1/gateways', { body, schema: gatewayKeySchema });
export const rotateGateway = (id: number) =>
  api.post(`/api/v1/gateways/${id}/rotate`, { schema: gatewayKeySchema });
export const revokeGateway = (id: number) =>
  api.post(`/api/v1/gateways/${id}/revoke`, { schema: gatewaySchema });

function useGatewayMutation<T, R>(fn: (input: T) => Promise<R>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: () =>
      queryClient.invalidateQueries({ queryKey: getGatewaysQueryOptions().queryKey }),
  });
}

export const useCreateGateway = () => useGatewayMutation(createGateway);
export const useRotateGateway = () => useGatewayMutation(rotateGateway);
export const useRevokeGateway = () => useGatewayMutation(revokeGateway);
