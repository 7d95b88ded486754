import type { QueryClient } from '@tanstack/react-query';
import type { ClaimDetail } from '@shared/schemas/claim';
import { api } from '@/lib/api-client';
import { claimFormKeys } from './claim-form-keys';

/** GET /api/claims/:id, fresh from the server into the claim's cache entry (after a conflict or an import). */
export function reloadClaim(queryClient: QueryClient, id: string): Promise<ClaimDetail> {
  return queryClient.fetchQuery({
    queryKey: claimFormKeys.claimDetail(id),
    queryFn: ({ signal }) => api.get<ClaimDetail>(`/api/claims/${encodeURIComponent(id)}`, undefined, signal),
    staleTime: 0,
  });
}
