import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ClaimDetail } from '@shared/schemas/claim';
import type { AdjustmentsInput } from '@shared/workflow/workflow-schemas';
import { api, isApiError } from '@/lib/api-client';
import { reviewKeys } from './review-keys';

/** POST /api/claims/:id/adjustments: a reviewer's line decisions, with the version seen. */
export function adjustClaim(id: string, body: AdjustmentsInput): Promise<ClaimDetail> {
  return api.post<ClaimDetail>(`/api/claims/${encodeURIComponent(id)}/adjustments`, body);
}

export function useAdjustClaim(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: AdjustmentsInput) => adjustClaim(id, body),
    onSuccess: (claim) => {
      queryClient.setQueryData(reviewKeys.detail(id), claim);
      void queryClient.invalidateQueries({ queryKey: reviewKeys.valuation(id) });
    },
    onError: (e) => {
      if (isApiError(e, 409)) void queryClient.invalidateQueries({ queryKey: reviewKeys.detail(id) });
    },
  });
}
