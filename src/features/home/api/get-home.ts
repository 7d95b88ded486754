import { queryOptions, useQuery } from '@tanstack/react-query';
import type { HomeResponse } from '@shared/schemas/home';
import { api } from '@/lib/api-client';

export function getHome(signal?: AbortSignal): Promise<HomeResponse> {
  return api.get<HomeResponse>('/api/home', undefined, signal);
}

export const homeQueries = {
  all: ['home'] as const,
  home: () =>
    queryOptions({
      queryKey: [...homeQueries.all] as const,
      queryFn: ({ signal }) => getHome(signal),
    }),
};

export function useHome() {
  return useQuery(homeQueries.home());
}
