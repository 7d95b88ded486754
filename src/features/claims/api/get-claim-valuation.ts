import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Valuation } from '@shared/calculations/valuation';
import { api } from '@/lib/api-client';
import { claimKeys } from './claim-keys';

export function getClaimValuation(id: string, signal?: AbortSignal): Promise<Valuation> {
  return api.get<Valuation>(`/api/claims/${encodeURIComponent(id)}/valuation`, undefined, signal);
}

export function claimValuationQuery(id: string) {
  return queryOptions({
    queryKey: claimKeys.valuation(id),
    queryFn: ({ signal }) => getClaimValuation(id, signal),
  });
}

/** A claim that cannot be valued yet answers 409 once; opening the page does not ask again. */
export function useClaimValuation(id: string) {
  return useQuery({ ...claimValuationQuery(id), retryOnMount: false });
}
