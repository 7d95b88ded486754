import { useCallback, useSyncExternalStore } from 'react';
import { queryOptions, useQueryClient } from '@tanstack/react-query';
import type { MeResponse } from '@shared/schemas/user';
import { api, isApiError } from '@/lib/api-client';
import { sessionQueryKey } from '@/lib/session-cache';

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
      queryKey: sessionQueryKey,
      queryFn: ({ signal }) => getMe(signal),
      staleTime: 5 * 60_000,
    }),
};

/**
 * The session as the cache holds it (loaders fetch it): a session, null when signed out,
 * undefined when not known yet. Read straight from the cache, so it stays right across
 * queryClient.clear() at sign-in, sign-out and session expiry, when query observers would
 * still point at the removed query.
 */
export function useSession(): MeResponse | null | undefined {
  const queryClient = useQueryClient();
  const subscribe = useCallback((onChange: () => void) => queryClient.getQueryCache().subscribe(onChange), [queryClient]);
  return useSyncExternalStore(subscribe, () => queryClient.getQueryData(authQueries.me().queryKey));
}
