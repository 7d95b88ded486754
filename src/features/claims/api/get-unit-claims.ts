import { useQuery } from '@tanstack/react-query';
import type { ClaimListItem } from '@shared/schemas/claim';
import { api } from '@/lib/api-client';
import { claimKeys } from './claim-keys';

/** The other claims on this claim's unit that the user may read, newest repair first. */
export function getUnitClaims(id: string, signal?: AbortSignal): Promise<{ items: ClaimListItem[] }> {
  return api.get<{ items: ClaimListItem[] }>(`/api/claims/${encodeURIComponent(id)}/unit-claims`, undefined, signal);
}

export function useUnitClaims(id: string) {
  return useQuery({ queryKey: claimKeys.unitClaims(id), queryFn: ({ signal }) => getUnitClaims(id, signal) });
}
