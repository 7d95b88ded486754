import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { ClaimListItem } from '@shared/schemas/claim';
import type { Page } from '@shared/schemas/pagination';
import { api } from '@/lib/api-client';
import { CLAIMS_PAGE_SIZE, type ClaimFilters } from '../filters';
import { claimKeys } from './claim-keys';

export type ClaimsPage = Page<ClaimListItem>;

export function getClaims(filters: ClaimFilters, signal?: AbortSignal): Promise<ClaimsPage> {
  return api.get<ClaimsPage>('/api/claims', { ...filters, limit: CLAIMS_PAGE_SIZE }, signal);
}

export function claimListQuery(filters: ClaimFilters) {
  return queryOptions({
    queryKey: claimKeys.list(filters),
    queryFn: ({ signal }) => getClaims(filters, signal),
  });
}

/** The current page, keeping the previous page on screen while the next one loads. */
export function useClaims(filters: ClaimFilters) {
  return useQuery({ ...claimListQuery(filters), placeholderData: keepPreviousData });
}
