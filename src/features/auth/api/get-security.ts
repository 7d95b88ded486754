import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SecurityStatus } from '@shared/schemas/second-factor';
import { api } from '@/lib/api-client';

export function getSecurity(signal?: AbortSignal): Promise<SecurityStatus> {
  return api.get<SecurityStatus>('/api/account/security', undefined, signal);
}

export const securityQueries = {
  status: () => queryOptions({ queryKey: ['account', 'security'] as const, queryFn: ({ signal }) => getSecurity(signal) }),
};

export function useSecurity() {
  return useQuery(securityQueries.status());
}
