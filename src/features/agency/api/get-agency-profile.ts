import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AgencyProfile } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { agencyKeys } from './agency-keys';

export function getAgencyProfile(signal?: AbortSignal): Promise<AgencyProfile> {
  return api.get<AgencyProfile>('/api/agency/profile', undefined, signal);
}

export const agencyProfileQuery = () => queryOptions({ queryKey: agencyKeys.profile(), queryFn: ({ signal }) => getAgencyProfile(signal) });

export function useAgencyProfile() {
  return useQuery(agencyProfileQuery());
}
