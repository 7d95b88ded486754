import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CertificationItem, RevokeCertificationBody } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { agencyKeys } from './agency-keys';

export function revokeCertification(id: string, body: RevokeCertificationBody): Promise<CertificationItem> {
  return api.post<CertificationItem>(`/api/agency/certifications/${encodeURIComponent(id)}/revocation`, body);
}

export function useRevokeCertification() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: RevokeCertificationBody }) => revokeCertification(id, body),
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: [...agencyKeys.all, 'certifications'] });
      void queryClient.invalidateQueries({ queryKey: agencyKeys.users('agency') });
    },
  });
}
