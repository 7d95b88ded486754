import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { UpdateUserBody, UserListItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { agencyKeys, usersPath, type UsersScope } from './agency-keys';

export function updateUser(scope: UsersScope, id: string, body: UpdateUserBody): Promise<UserListItem> {
  return api.patch<UserListItem>(`${usersPath[scope]}/${encodeURIComponent(id)}`, body);
}

export function useUpdateUser(scope: UsersScope) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: UpdateUserBody }) => updateUser(scope, id, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: agencyKeys.users(scope) }),
  });
}
