import { claimStates, type ClaimState } from '@shared/schemas/claim';

export const claimSortKeys = ['createdAt', 'submittedAt', 'repairDate', 'number', 'claimedTotalCents', 'state'] as const;
export type ClaimSortKey = (typeof claimSortKeys)[number];
export type SortDir = 'asc' | 'desc';

/** The claim list's filters, exactly as they sit in the URL's search params. */
export interface ClaimFilters {
  state?: ClaimState;
  agency?: string;
  q?: string;
  from?: string;
  to?: string;
  cursor?: string;
  sort?: ClaimSortKey;
  dir?: SortDir;
}

export const CLAIMS_PAGE_SIZE = 25;
const isoDate = /^\d{4}-\d{2}-\d{2}$/;

function pick<T extends string>(value: string | null, allowed: readonly T[]): T | undefined {
  return value !== null && (allowed as readonly string[]).includes(value) ? (value as T) : undefined;
}

function text(value: string | null, max: number): string | undefined {
  const v = value?.trim();
  return v ? v.slice(0, max) : undefined;
}

/** Reads filters from search params, dropping anything the API would refuse. */
export function parseClaimFilters(params: URLSearchParams): ClaimFilters {
  const from = params.get('from');
  const to = params.get('to');
  const filters: ClaimFilters = {
    state: pick(params.get('state'), claimStates),
    agency: text(params.get('agency'), 64),
    q: text(params.get('q'), 80),
    from: from && isoDate.test(from) ? from : undefined,
    to: to && isoDate.test(to) ? to : undefined,
    cursor: text(params.get('cursor'), 200),
    sort: pick(params.get('sort'), claimSortKeys),
    dir: pick(params.get('dir'), ['asc', 'desc'] as const),
  };
  // Stable keys: undefined fields are left out so equal filters give equal query keys.
  return Object.fromEntries(Object.entries(filters).filter(([, v]) => v !== undefined)) as ClaimFilters;
}

/** Writes filters back to search params (in a fixed order, empty ones left out). */
export function filtersToParams(filters: ClaimFilters): URLSearchParams {
  const params = new URLSearchParams();
  for (const key of ['state', 'agency', 'q', 'from', 'to', 'sort', 'dir', 'cursor'] as const) {
    const v = filters[key];
    if (v) params.set(key, v);
  }
  return params;
}

export function hasNarrowingFilters(filters: ClaimFilters): boolean {
  return Boolean(filters.state || filters.agency || filters.q || filters.from || filters.to);
}
