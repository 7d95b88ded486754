import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { UpdateAgencyBody, AgencyDetail } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { renameOwnOrganisation } from '@/lib/session-cache';
import { adminKeys, enc } from './admin-keys';

export function updateAgency(id: string, body: UpdateAgencyBody): Promise<AgencyDetail> {
  return api.patch<AgencyDetail>(`/api/admin/agencies/${enc(id)}`, body);
}

export function useUpdateAgency() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: UpdateAgencyBody }) => updateAgency(id, body),
    onSuccess: (agency) => {
      void queryClient.invalidateQueries({ queryKey: adminKeys.agencies() });
      // only changes anything when the admin renamed their own organisation
      renameOwnOrganisation(queryClient, agency.id, agency.name);
    },
  });
}
