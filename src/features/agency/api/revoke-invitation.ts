import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { InvitationListItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { agencyKeys } from './agency-keys';

export function revokeInvitation(id: string): Promise<InvitationListItem> {
  return api.post<InvitationListItem>(`/api/invitations/${encodeURIComponent(id)}/revoke`, {});
}

export function useRevokeInvitation() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: revokeInvitation, onSuccess: () => queryClient.invalidateQueries({ queryKey: agencyKeys.invitations() }) });
}
