import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ClaimDetail } from '@shared/schemas/claim';
import { api, ApiError } from '@/lib/api-client';
import { reviewKeys } from './review-keys';

/**
 * Takes a claim from the queue: reads it for its version, then sends the start-review move.
 * A claim another reviewer already took answers 409 with who has it.
 */
export async function startReview(id: string): Promise<ClaimDetail> {
  const path = `/api/claims/${encodeURIComponent(id)}`;
  const claim = await api.get<ClaimDetail>(path);
  if (!claim.allowedActions.includes('start_review')) {
    throw new ApiError({
      status: 409,
      code: 'already_taken',
      message: claim.reviewerName ? `${claim.reviewerName} is already reviewing ${claim.number}.` : `${claim.number} can no longer be started.`,
    });
  }
  return api.post<ClaimDetail>(`${path}/transitions`, { type: 'start_review', version: claim.version });
}

export function useStartReview() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: startReview,
    onSuccess: (claim) => queryClient.setQueryData(reviewKeys.detail(claim.id), claim),
    onSettled: () => queryClient.invalidateQueries({ queryKey: ['claims', 'review-queue'] }),
  });
}
