import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { agencyKeys } from './agency-keys';

export interface FamilyOption {
  id: string;
  code: string;
  name: string;
}

/** Active product families, for certifying technicians. */
export async function getFamilies(signal?: AbortSignal): Promise<FamilyOption[]> {
  const body = await api.get<{ items: FamilyOption[] }>('/api/agency/families', undefined, signal);
  return body.items;
}

export const familiesQuery = () => queryOptions({ queryKey: agencyKeys.families(), queryFn: ({ signal }) => getFamilies(signal), staleTime: 10 * 60_000 });

export function useFamilies() {
  return useQuery(familiesQuery());
}
