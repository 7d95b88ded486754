import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { evidenceKeys } from './evidence-keys';

/** DELETE /api/attachments/:id: removes a file while the claim is a draft or returned. */
export function deleteAttachment(id: string): Promise<void> {
  return api.delete<void>(`/api/attachments/${encodeURIComponent(id)}`);
}

export function useDeleteAttachment(claimId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteAttachment,
    onSettled: () => void queryClient.invalidateQueries({ queryKey: evidenceKeys.claim(claimId) }),
  });
}
