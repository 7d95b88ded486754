import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ModelItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

export async function getModels(signal?: AbortSignal): Promise<ModelItem[]> {
  const body = await api.get<{ items: ModelItem[] }>('/api/admin/models', undefined, signal);
  return body.items;
}

export const modelsQuery = () => queryOptions({ queryKey: adminKeys.models(), queryFn: ({ signal }) => getModels(signal) });

export function useModels() {
  return useQuery(modelsQuery());
}
