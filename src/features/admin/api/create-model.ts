import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateModelBody, ModelItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

export function createModel(body: CreateModelBody): Promise<ModelItem> {
  return api.post<ModelItem>('/api/admin/models', body);
}

export function useCreateModel() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createModel,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.models() }),
  });
}
