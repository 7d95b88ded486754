import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AgencyDetail } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys, enc } from './admin-keys';

export function getAgency(id: string, signal?: AbortSignal): Promise<AgencyDetail> {
  return api.get<AgencyDetail>(`/api/admin/agencies/${enc(id)}`, undefined, signal);
}

export const agencyQuery = (id: string) => queryOptions({ queryKey: adminKeys.agency(id), queryFn: ({ signal }) => getAgency(id, signal) });

export function useAgency(id: string | null) {
  return useQuery({ ...agencyQuery(id ?? ''), enabled: !!id });
}
