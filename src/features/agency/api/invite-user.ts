import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { InvitationListItem, InviteBody } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { agencyKeys, usersPath, type UsersScope } from './agency-keys';

export function inviteUser(scope: UsersScope, body: InviteBody): Promise<InvitationListItem> {
  return api.post<InvitationListItem>(usersPath[scope], body);
}

export function useInviteUser(scope: UsersScope) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: InviteBody) => inviteUser(scope, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: agencyKeys.invitations() }),
  });
}
