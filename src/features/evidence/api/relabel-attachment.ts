import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AttachmentView } from '@shared/schemas/evidence';
import type { RelabelAttachmentInput } from '@shared/schemas/evidence-changes';
import { api } from '@/lib/api-client';
import { evidenceKeys } from './evidence-keys';

/** PATCH /api/attachments/:id: what the file shows, while the claim is a draft or returned. */
export function relabelAttachment(id: string, body: RelabelAttachmentInput): Promise<AttachmentView> {
  return api.patch<AttachmentView>(`/api/attachments/${encodeURIComponent(id)}`, body);
}

export function useRelabelAttachment(claimId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: RelabelAttachmentInput }) => relabelAttachment(id, body),
    onSettled: () => void queryClient.invalidateQueries({ queryKey: evidenceKeys.claim(claimId) }),
  });
}
