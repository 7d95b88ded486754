import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ReadingSpecItem, UpdateReadingSpecBody } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys, enc } from './admin-keys';

export function updateReadingSpec(modelId: string, specId: string, body: UpdateReadingSpecBody): Promise<ReadingSpecItem> {
  return api.patch<ReadingSpecItem>(`/api/admin/models/${enc(modelId)}/reading-specs/${enc(specId)}`, body);
}

export function useUpdateReadingSpec() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ modelId, specId, body }: { modelId: string; specId: string; body: UpdateReadingSpecBody }) => updateReadingSpec(modelId, specId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.models() }),
  });
}
