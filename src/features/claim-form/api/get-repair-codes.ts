import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CatalogList, CatalogRepairCode } from '@shared/schemas/catalog';
import { api } from '@/lib/api-client';
import { claimFormKeys } from './claim-form-keys';

export function getRepairCodes(family: string, signal?: AbortSignal): Promise<CatalogList<CatalogRepairCode>> {
  return api.get<CatalogList<CatalogRepairCode>>('/api/catalog/repair-codes', { family }, signal);
}

/** The labor-time guide of one product family. */
export function repairCodesQuery(family: string) {
  return queryOptions({ queryKey: claimFormKeys.repairCodes(family), queryFn: ({ signal }) => getRepairCodes(family, signal), staleTime: 5 * 60_000 });
}

export function useRepairCodes(family: string | null) {
  return useQuery({ ...repairCodesQuery(family ?? ''), enabled: !!family });
}
