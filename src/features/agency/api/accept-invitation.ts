import { useMutation } from '@tanstack/react-query';
import type { AcceptInvitationBody } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';

export function acceptInvitation(body: AcceptInvitationBody): Promise<{ email: string }> {
  return api.post<{ email: string }>('/api/invitations/accept', body);
}

export function useAcceptInvitation() {
  return useMutation({ mutationFn: acceptInvitation });
}
