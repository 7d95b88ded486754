import type { ClaimFilters } from '../filters';

/** Query keys of the claims feature; invalidating ['claims'] refreshes every list and claim. */
export const claimKeys = {
  all: ['claims'] as const,
  lists: () => [...claimKeys.all, 'list'] as const,
  list: (filters: ClaimFilters) => [...claimKeys.lists(), filters] as const,
  details: () => [...claimKeys.all, 'detail'] as const,
  detail: (id: string) => [...claimKeys.details(), id] as const,
  valuation: (id: string) => [...claimKeys.detail(id), 'valuation'] as const,
  unitClaims: (id: string) => [...claimKeys.detail(id), 'unit-claims'] as const,
  changes: (id: string) => [...claimKeys.detail(id), 'changes'] as const,
};
