import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CertificationItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { agencyKeys } from './agency-keys';

export async function getCertifications(userId?: string, signal?: AbortSignal): Promise<CertificationItem[]> {
  const body = await api.get<{ items: CertificationItem[] }>('/api/agency/certifications', { userId }, signal);
  return body.items;
}

export const certificationsQuery = (userId?: string) =>
  queryOptions({ queryKey: agencyKeys.certifications(userId), queryFn: ({ signal }) => getCertifications(userId, signal) });

export function useCertifications(userId?: string) {
  return useQuery(certificationsQuery(userId));
}
