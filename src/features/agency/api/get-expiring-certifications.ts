import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CertificationItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { agencyKeys } from './agency-keys';

/** Certificates in force today that end within 30 days, with no renewal on file. */
export async function getExpiringCertifications(signal?: AbortSignal): Promise<CertificationItem[]> {
  const body = await api.get<{ items: CertificationItem[] }>('/api/agency/certifications/expiring', undefined, signal);
  return body.items;
}

export const expiringCertificationsQuery = () => queryOptions({ queryKey: agencyKeys.expiring(), queryFn: ({ signal }) => getExpiringCertifications(signal) });

export function useExpiringCertifications() {
  return useQuery(expiringCertificationsQuery());
}
