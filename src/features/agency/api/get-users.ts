import { queryOptions, useQuery } from '@tanstack/react-query';
import type { UserListItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { agencyKeys, usersPath, type UsersScope } from './agency-keys';

export async function getUsers(scope: UsersScope, signal?: AbortSignal): Promise<UserListItem[]> {
  const body = await api.get<{ items: UserListItem[] }>(usersPath[scope], undefined, signal);
  return body.items;
}

export const usersQuery = (scope: UsersScope) => queryOptions({ queryKey: agencyKeys.users(scope), queryFn: ({ signal }) => getUsers(scope, signal) });

export function useUsers(scope: UsersScope) {
  return useQuery(usersQuery(scope));
}
