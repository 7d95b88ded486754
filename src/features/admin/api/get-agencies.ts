import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AgencyListItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

export async function getAgencies(signal?: AbortSignal): Promise<AgencyListItem[]> {
  const body = await api.get<{ items: AgencyListItem[] }>('/api/admin/agencies', undefined, signal);
  return body.items;
}

export const agenciesQuery = () => queryOptions({ queryKey: adminKeys.agencies(), queryFn: ({ signal }) => getAgencies(signal) });

export function useAgencies() {
  return useQuery(agenciesQuery());
}
