import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CatalogList, CatalogModel } from '@shared/schemas/catalog';
import { api } from '@/lib/api-client';
import { reviewKeys } from './review-keys';

export function getModels(signal?: AbortSignal): Promise<CatalogList<CatalogModel>> {
  return api.get<CatalogList<CatalogModel>>('/api/catalog/models', undefined, signal);
}

/** Every model, for the queue's model filter. */
export function modelsQuery() {
  return queryOptions({ queryKey: reviewKeys.models(), queryFn: ({ signal }) => getModels(signal), staleTime: 5 * 60_000 });
}

export function useModels() {
  return useQuery(modelsQuery());
}
