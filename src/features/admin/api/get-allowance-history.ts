import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AllowanceHistoryItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys, enc } from './admin-keys';

/** Every dated allowance of a repair code, oldest first ("0001-01-01": from the start). */
export async function getAllowanceHistory(id: string, signal?: AbortSignal): Promise<AllowanceHistoryItem[]> {
  const body = await api.get<{ items: AllowanceHistoryItem[] }>(`/api/admin/repair-codes/${enc(id)}/allowances`, undefined, signal);
  return body.items;
}

export const allowanceHistoryQuery = (id: string) => queryOptions({ queryKey: adminKeys.allowances(id), queryFn: ({ signal }) => getAllowanceHistory(id, signal) });

export function useAllowanceHistory(id: string) {
  return useQuery(allowanceHistoryQuery(id));
}
