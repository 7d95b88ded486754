import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ClaimDetail } from '@shared/schemas/claim';
import type { CommentInput } from '@shared/workflow/workflow-schemas';
import { api } from '@/lib/api-client';

export type ClaimComment = ClaimDetail['comments'][number];

/** POST /api/claims/:id/comments */
export function addComment(claimId: string, body: CommentInput): Promise<ClaimComment> {
  return api.post<ClaimComment>(`/api/claims/${encodeURIComponent(claimId)}/comments`, body);
}

/** Adds the comment to the cached claim at once, then reloads the claim for the server's order. */
export function useAddComment(claimId: string) {
  const queryClient = useQueryClient();
  const key = ['claims', 'detail', claimId] as const;
  return useMutation({
    mutationFn: (body: CommentInput) => addComment(claimId, body),
    onSuccess: (comment) => {
      queryClient.setQueryData<ClaimDetail>(key, (c) => (c ? { ...c, comments: [...c.comments.filter((x) => x.id !== comment.id), comment] } : c));
      void queryClient.invalidateQueries({ queryKey: key, exact: true });
    },
  });
}
