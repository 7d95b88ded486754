import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { adminKeys, enc } from './admin-keys';

/** Only a reading no claim has recorded can go; the server answers 409 otherwise. */
export function deleteReadingSpec(modelId: string, specId: string): Promise<void> {
  return api.delete<void>(`/api/admin/models/${enc(modelId)}/reading-specs/${enc(specId)}`);
}

export function useDeleteReadingSpec() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ modelId, specId }: { modelId: string; specId: string }) => deleteReadingSpec(modelId, specId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.models() }),
  });
}
