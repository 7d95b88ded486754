import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AttachmentView } from '@shared/schemas/evidence';
import type { RetractAttachmentInput } from '@shared/schemas/evidence-changes';
import { api } from '@/lib/api-client';
import { evidenceKeys } from './evidence-keys';

/** POST /api/attachments/:id/retraction: withdraws a file of a filed claim, with the reason the reviewer reads. */
export function retractAttachment(id: string, body: RetractAttachmentInput): Promise<AttachmentView> {
  return api.post<AttachmentView>(`/api/attachments/${encodeURIComponent(id)}/retraction`, body);
}

export function useRetractAttachment(claimId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: RetractAttachmentInput }) => retractAttachment(id, body),
    onSettled: () => void queryClient.invalidateQueries({ queryKey: evidenceKeys.claim(claimId) }),
  });
}
