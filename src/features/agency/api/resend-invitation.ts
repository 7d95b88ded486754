import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { InvitationListItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { agencyKeys } from './agency-keys';

/** A new link and a new 7-day expiry; the old link stops working. */
export function resendInvitation(id: string): Promise<InvitationListItem> {
  return api.post<InvitationListItem>(`/api/invitations/${encodeURIComponent(id)}/resend`, {});
}

export function useResendInvitation() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: resendInvitation, onSuccess: () => queryClient.invalidateQueries({ queryKey: agencyKeys.invitations() }) });
}
