import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreatePartBody, PartItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

export function createPart(body: CreatePartBody): Promise<PartItem> {
  return api.post<PartItem>('/api/admin/parts', body);
}

export function useCreatePart() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createPart,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.parts() }),
  });
}
