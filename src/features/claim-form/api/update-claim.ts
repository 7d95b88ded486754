import type { z } from 'zod';
import type { ClaimDetail, updateClaimSchema } from '@shared/schemas/claim';
import { api } from '@/lib/api-client';

export type UpdateClaimBody = z.input<typeof updateClaimSchema>;

/** PATCH /api/claims/:id with the version the form last saw; a stale version answers 409. */
export function updateClaim(id: string, body: UpdateClaimBody): Promise<ClaimDetail> {
  return api.patch<ClaimDetail>(`/api/claims/${encodeURIComponent(id)}`, body);
}
