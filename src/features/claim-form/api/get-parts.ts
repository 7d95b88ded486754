import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CatalogList, CatalogPart } from '@shared/schemas/catalog';
import { api } from '@/lib/api-client';
import { claimFormKeys } from './claim-form-keys';

export function getParts(family: string, signal?: AbortSignal): Promise<CatalogList<CatalogPart>> {
  return api.get<CatalogList<CatalogPart>>('/api/catalog/parts', { family }, signal);
}

/** The parts that fit one product family (and the parts that fit every family). */
export function partsQuery(family: string) {
  return queryOptions({ queryKey: claimFormKeys.parts(family), queryFn: ({ signal }) => getParts(family, signal), staleTime: 5 * 60_000 });
}

export function useParts(family: string | null) {
  return useQuery({ ...partsQuery(family ?? ''), enabled: !!family });
}
