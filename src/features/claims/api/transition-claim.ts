import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ClaimDetail } from '@shared/schemas/claim';
import type { TransitionInput } from '@shared/workflow/workflow-schemas';
import { api, isApiError } from '@/lib/api-client';
import { claimKeys } from './claim-keys';

/** POST /api/claims/:id/transitions: one workflow move, carrying the version the user saw. */
export function transitionClaim(id: string, body: TransitionInput): Promise<ClaimDetail> {
  return api.post<ClaimDetail>(`/api/claims/${encodeURIComponent(id)}/transitions`, body);
}

/**
 * A move on one claim. The answer is the claim after the move, put in the cache at once; a 409
 * (someone else moved or changed it) reloads the claim so the page shows what is true now.
 */
export function useTransitionClaim(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: TransitionInput) => transitionClaim(id, body),
    onSuccess: (claim) => {
      queryClient.setQueryData(claimKeys.detail(id), claim);
      void queryClient.invalidateQueries({ queryKey: claimKeys.valuation(id) });
      void queryClient.invalidateQueries({ queryKey: claimKeys.lists() });
      void queryClient.invalidateQueries({ queryKey: ['claims', 'review-queue'] });
      void queryClient.invalidateQueries({ queryKey: ['home'] });
    },
    onError: (error) => {
      if (isApiError(error, 409)) void queryClient.invalidateQueries({ queryKey: claimKeys.detail(id) });
    },
  });
}
