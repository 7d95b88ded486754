import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ClaimDetail } from '@shared/schemas/claim';
import type { TakeOverInput } from '@shared/workflow/workflow-schemas';
import { api, isApiError } from '@/lib/api-client';
import { reviewKeys } from './review-keys';

/** POST /api/claims/:id/take-over: take a review over from the reviewer who holds it, with a reason. */
export function takeOverClaim(id: string, body: TakeOverInput): Promise<ClaimDetail> {
  return api.post<ClaimDetail>(`/api/claims/${encodeURIComponent(id)}/take-over`, body);
}

export function useTakeOverClaim(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: TakeOverInput) => takeOverClaim(id, body),
    onSuccess: (claim) => {
      queryClient.setQueryData(reviewKeys.detail(id), claim);
      void queryClient.invalidateQueries({ queryKey: ['claims', 'list'] });
    },
    onError: (e) => {
      if (isApiError(e, 409)) void queryClient.invalidateQueries({ queryKey: reviewKeys.detail(id) });
    },
  });
}
