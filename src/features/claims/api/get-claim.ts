import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ClaimDetail } from '@shared/schemas/claim';
import { api } from '@/lib/api-client';
import { claimKeys } from './claim-keys';

export function getClaim(id: string, signal?: AbortSignal): Promise<ClaimDetail> {
  return api.get<ClaimDetail>(`/api/claims/${encodeURIComponent(id)}`, undefined, signal);
}

export function claimDetailQuery(id: string) {
  return queryOptions({
    queryKey: claimKeys.detail(id),
    queryFn: ({ signal }) => getClaim(id, signal),
  });
}

export function useClaim(id: string) {
  return useQuery(claimDetailQuery(id));
}
