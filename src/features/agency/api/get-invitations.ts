import { queryOptions, useQuery } from '@tanstack/react-query';
import type { InvitationListItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { agencyKeys } from './agency-keys';

/** Open invitations of the signed-in admin's organisation (pending and expired). */
export async function getInvitations(signal?: AbortSignal): Promise<InvitationListItem[]> {
  const body = await api.get<{ items: InvitationListItem[] }>('/api/invitations', undefined, signal);
  return body.items;
}

export const invitationsQuery = () => queryOptions({ queryKey: agencyKeys.invitations(), queryFn: ({ signal }) => getInvitations(signal) });

export function useInvitations() {
  return useQuery(invitationsQuery());
}
