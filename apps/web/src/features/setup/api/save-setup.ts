import type { AreaInput, MachineInput, PointInput, SiteInput } from '@turnstone/contracts/setup';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import { getSetupQueryOptions } from './get-setup.ts';

type Saved = { id: number };

/** Create when `id` is absent, else update. */
export const saveSite = ({ id, ...body }: SiteInput & { id?: number }) =>
  id
    ? api.patch<never>(`/api/v1/sites/${id}`, { body })
    : api.post<never>('/api/v1/sites', { body });
export const saveArea = ({ id, ...body }: AreaInput & { id?: number }) =>
  id
    ? api.patch<never>(`/api/v1/areas/${id}`, { body: { name: body.name } })
    : api.post<never>('/api/v1/areas', { body });
export const saveMachine = ({ id, ...body }: MachineInput & { id?: number }) =>
  id
    ? api.patch<never>(`/api/v1/machines/${id}`, { body })
    : api.post<never>('/api/v1/machines', { body });
export const savePoint = ({ id, ...body }: PointInput & { id?: number }) =>
  id
    ? api.patch<never>(`/api/v1/points/${id}`, { body })
    : api.post<never>('/api/v1/points', { body });
export const deleteMachine = (id: number) => api.delete<never>(`/api/v1/machines/${id}`);
export const deletePoint = (id: number) => api.delete<never>(`/api/v1/points/${id}`);

/** A setup mutation that refreshes the setup tree and the fleet afterwards. */
export function useSetupMutation<T>(fn: (input: T) => Promise<unknown>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (input: T) => (await fn(input)) as Saved | undefined,
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: getSetupQueryOptions().queryKey });
      await queryClient.invalidateQueries({ queryKey: ['fleet'] });
    },
  });
}
