import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import type { ClaimDetail, createClaimSchema } from '@shared/schemas/claim';
import { api } from '@/lib/api-client';
import { claimFormKeys } from './claim-form-keys';

export type CreateClaimBody = z.input<typeof createClaimSchema>;

/**
 * POST /api/claims: a draft for the unit with this serial, in the session's agency. The
 * idempotency key names the intended action, so a double click or a retry makes one draft.
 */
export function createClaim({ body, idempotencyKey }: { body: CreateClaimBody; idempotencyKey: string }): Promise<ClaimDetail> {
  return api.post<ClaimDetail>('/api/claims', body, { idempotencyKey });
}

export function useCreateClaim() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createClaim,
    onSuccess: (claim) => {
      queryClient.setQueryData(claimFormKeys.claimDetail(claim.id), claim);
      void queryClient.invalidateQueries({ queryKey: ['claims', 'list'] });
      void queryClient.invalidateQueries({ queryKey: ['home'] });
    },
  });
}
