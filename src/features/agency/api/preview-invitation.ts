import { queryOptions, useQuery } from '@tanstack/react-query';
import type { InvitationPreview } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { agencyKeys } from './agency-keys';

/** Signed out: who the invitation is for, before a password is chosen. */
export function previewInvitation(token: string): Promise<InvitationPreview> {
  return api.post<InvitationPreview>('/api/invitations/preview', { token });
}

export const invitationPreviewQuery = (token: string) =>
  queryOptions({ queryKey: agencyKeys.invitationPreview(token), queryFn: () => previewInvitation(token), retry: false, staleTime: Infinity });

export function useInvitationPreview(token: string) {
  return useQuery({ ...invitationPreviewQuery(token), enabled: token.length > 0 });
}
