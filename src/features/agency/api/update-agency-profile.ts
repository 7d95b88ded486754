import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AgencyProfile, UpdateAgencyProfileBody } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { renameOwnOrganisation } from '@/lib/session-cache';
import { agencyKeys } from './agency-keys';

export function updateAgencyProfile(body: UpdateAgencyProfileBody): Promise<AgencyProfile> {
  return api.patch<AgencyProfile>('/api/agency/profile', body);
}

export function useUpdateAgencyProfile() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateAgencyProfile,
    onSuccess: (profile) => {
      queryClient.setQueryData(agencyKeys.profile(), profile);
      // the header names the agency from the session: show the new name there at once
      renameOwnOrganisation(queryClient, profile.id, profile.name);
    },
  });
}
