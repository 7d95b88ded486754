import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PartItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

export async function getParts(signal?: AbortSignal): Promise<PartItem[]> {
  const body = await api.get<{ items: PartItem[] }>('/api/admin/parts', undefined, signal);
  return body.items;
}

export const partsQuery = () => queryOptions({ queryKey: adminKeys.parts(), queryFn: ({ signal }) => getParts(signal) });

export function useParts() {
  return useQuery(partsQuery());
}
