import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MeResponse } from '@shared/schemas/user';
import { api, isApiError } from '@/lib/api-client';

/** The session: the user, the organisation and the CASL rules; null when signed out (401). */
export async function getMe(signal?: AbortSignal): Promise<MeResponse | null> {
  try {
    return await api.get<MeResponse>('/api/auth/me', undefined, signal);
  } catch (e) {
    if (isApiError(e, 401)) return null;
    throw e;
  }
}

export const authQueries = {
  all: ['auth'] as const,
  me: () =>
    queryOptions({
      queryKey: [...authQueries.all, 'me'] as const,
      queryFn: ({ signal }) => getMe(signal),
      staleTime: 5 * 60_000,
    }),
};

export function useMe() {
  return useQuery(authQueries.me());
}
