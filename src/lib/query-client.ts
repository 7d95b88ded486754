import { QueryCache, QueryClient, type DefaultOptions } from '@tanstack/react-query';
import { isApiError } from './api-client';

export const queryDefaults: DefaultOptions = {
  queries: {
    staleTime: 30_000,
    refetchOnWindowFocus: false,
    // A 4xx will not change by asking again; network trouble and 5xx get two more tries.
    retry: (failureCount, error) => {
      if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
      return failureCount < 2;
    },
  },
  mutations: { retry: false },
};

export interface QueryClientHooks {
  /** A query answered 401: the session ended (idle limit, sign-out elsewhere, role change). */
  onUnauthenticated?: () => void;
}

export function createQueryClient(hooks: QueryClientHooks = {}): QueryClient {
  return new QueryClient({
    defaultOptions: queryDefaults,
    queryCache: new QueryCache({
      onError: (error) => {
        if (isApiError(error, 401)) hooks.onUnauthenticated?.();
      },
    }),
  });
}
