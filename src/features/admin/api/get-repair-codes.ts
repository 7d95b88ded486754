import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RepairCodeItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

export async function getRepairCodes(signal?: AbortSignal): Promise<RepairCodeItem[]> {
  const body = await api.get<{ items: RepairCodeItem[] }>('/api/admin/repair-codes', undefined, signal);
  return body.items;
}

export const repairCodesQuery = () => queryOptions({ queryKey: adminKeys.repairCodes(), queryFn: ({ signal }) => getRepairCodes(signal) });

export function useRepairCodes() {
  return useQuery(repairCodesQuery());
}
