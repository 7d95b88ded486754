import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, isApiError } from '@/lib/api-client';

export interface AgencyOption {
  id: string;
  name: string;
}

/**
 * The service agencies a manufacturer user may filter by. Answers null when the server
 * offers no agency list to this user (404 or 403), so the list falls back to the
 * agencies seen in the claims themselves.
 */
export async function getAgencies(signal?: AbortSignal): Promise<AgencyOption[] | null> {
  try {
    const body = await api.get<AgencyOption[] | { items: AgencyOption[] }>('/api/agencies', undefined, signal);
    const items = Array.isArray(body) ? body : body?.items;
    if (!Array.isArray(items)) return null;
    return items.filter((a) => a && typeof a.id === 'string' && typeof a.name === 'string').map((a) => ({ id: a.id, name: a.name }));
  } catch (e) {
    if (isApiError(e, 404) || isApiError(e, 403)) return null;
    throw e;
  }
}

export const agencyQueries = {
  list: () =>
    queryOptions({
      queryKey: ['agencies', 'list'] as const,
      queryFn: ({ signal }) => getAgencies(signal),
      staleTime: 10 * 60_000,
    }),
};

export function useAgencies(enabled: boolean) {
  return useQuery({ ...agencyQueries.list(), enabled });
}
