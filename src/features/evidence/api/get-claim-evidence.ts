import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ClaimEvidence } from '@shared/schemas/evidence';
import { api } from '@/lib/api-client';
import { evidenceKeys } from './evidence-keys';

export const getClaimEvidence = (claimId: string, signal?: AbortSignal) =>
  api.get<ClaimEvidence>(`/api/claims/${encodeURIComponent(claimId)}/attachments`, undefined, signal);

export const claimEvidenceQuery = (claimId: string) =>
  queryOptions({ queryKey: evidenceKeys.evidence(claimId), queryFn: ({ signal }) => getClaimEvidence(claimId, signal) });

export function useClaimEvidence(claimId: string) {
  return useQuery(claimEvidenceQuery(claimId));
}
