import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { UpdatePartBody, PartItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys, enc } from './admin-keys';

export function updatePart(id: string, body: UpdatePartBody): Promise<PartItem> {
  return api.patch<PartItem>(`/api/admin/parts/${enc(id)}`, body);
}

export function useUpdatePart() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: UpdatePartBody }) => updatePart(id, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.parts() }),
  });
}
