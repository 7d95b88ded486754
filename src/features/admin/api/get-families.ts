import { queryOptions, useQuery } from '@tanstack/react-query';
import type { FamilyItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

export async function getFamilies(signal?: AbortSignal): Promise<FamilyItem[]> {
  const body = await api.get<{ items: FamilyItem[] }>('/api/admin/families', undefined, signal);
  return body.items;
}

export const familiesQuery = () => queryOptions({ queryKey: adminKeys.families(), queryFn: ({ signal }) => getFamilies(signal) });

export function useFamilies() {
  return useQuery(familiesQuery());
}
