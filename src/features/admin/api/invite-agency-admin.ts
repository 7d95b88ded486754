import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AgencyDetail } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys, enc } from './admin-keys';

/** For an agency without an active admin: its first (or a replacement). */
export function inviteAgencyAdmin(id: string, email: string): Promise<AgencyDetail> {
  return api.post<AgencyDetail>(`/api/admin/agencies/${enc(id)}/admin-invitation`, { email });
}

export function useInviteAgencyAdmin() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, email }: { id: string; email: string }) => inviteAgencyAdmin(id, email),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.agencies() }),
  });
}
