import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { UpdateModelBody, ModelItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys, enc } from './admin-keys';

export function updateModel(id: string, body: UpdateModelBody): Promise<ModelItem> {
  return api.patch<ModelItem>(`/api/admin/models/${enc(id)}`, body);
}

export function useUpdateModel() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: UpdateModelBody }) => updateModel(id, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.models() }),
  });
}
