import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CatalogList, CatalogModel } from '@shared/schemas/catalog';
import { api } from '@/lib/api-client';
import { claimFormKeys } from './claim-form-keys';

export function getModels(family: string, signal?: AbortSignal): Promise<CatalogList<CatalogModel>> {
  return api.get<CatalogList<CatalogModel>>('/api/catalog/models', { family }, signal);
}

/** Models of one family with their reading specifications and component terms. */
export function modelsQuery(family: string) {
  return queryOptions({ queryKey: claimFormKeys.models(family), queryFn: ({ signal }) => getModels(family, signal), staleTime: 5 * 60_000 });
}

export function useModels(family: string | null) {
  return useQuery({ ...modelsQuery(family ?? ''), enabled: !!family });
}
