import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ClaimValuationBasis } from '@shared/schemas/claim';
import { api } from '@/lib/api-client';
import { claimFormKeys } from './claim-form-keys';

/** GET /api/claims/:id/valuation-input: the stored claim's valuation input for the live preview. */
export function getValuationBasis(id: string, signal?: AbortSignal): Promise<ClaimValuationBasis> {
  return api.get<ClaimValuationBasis>(`/api/claims/${encodeURIComponent(id)}/valuation-input`, undefined, signal);
}

export function valuationBasisQuery(id: string) {
  return queryOptions({
    queryKey: claimFormKeys.valuationBasis(id),
    queryFn: ({ signal }) => getValuationBasis(id, signal),
  });
}

export function useValuationBasis(id: string) {
  return useQuery({ ...valuationBasisQuery(id), placeholderData: (previous) => previous });
}
