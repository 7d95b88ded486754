import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ClaimReadingsReport } from '@shared/schemas/evidence';
import { api } from '@/lib/api-client';
import { evidenceKeys } from './evidence-keys';

export const getClaimReadings = (claimId: string, signal?: AbortSignal) =>
  api.get<ClaimReadingsReport>(`/api/claims/${encodeURIComponent(claimId)}/readings`, undefined, signal);

export const claimReadingsQuery = (claimId: string) =>
  queryOptions({ queryKey: evidenceKeys.readings(claimId), queryFn: ({ signal }) => getClaimReadings(claimId, signal) });

export function useClaimReadings(claimId: string) {
  return useQuery(claimReadingsQuery(claimId));
}
