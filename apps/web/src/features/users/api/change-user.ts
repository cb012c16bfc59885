import { userSummarySchema, type InviteUser, type UpdateUser } from '@turnstone/contracts/users';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import { getUsersQueryOptions } from './get-users.ts';

export const inviteUser = (body: InviteUser) =>
  api.post('/api/v1/users/invite', { body, schema: userSummarySchema });
export const updateUser = ({ id, ...body }: UpdateUser & { id: number }) =>
  api.patch(`/api/v1/users/${id}`, { body, schema: userSummarySchema });
export const setUserDisabled = ({ id, disabled }: { id: number; disabled: boolean }) =>
  api.post(`/api/v1/users/${id}/${disabled ? 'disable' : 'enable'}`, { schema: userSummarySchema });

function useUsersMutation<A, R>(fn: (a: A) => Promise<R>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getUsersQueryOptions().queryKey }),
  });
}

export const useInviteUser = () => useUsersMutation(inviteUser);
export const useUpdateUser = () => useUsersMutation(updateUser);
export const useSetUserDisabled = () => useUsersMutation(setUserDisabled);
