import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CertificationItem, UpdateCertificationBody } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { agencyKeys } from './agency-keys';

export function updateCertification(id: string, body: UpdateCertificationBody): Promise<CertificationItem> {
  return api.patch<CertificationItem>(`/api/agency/certifications/${encodeURIComponent(id)}`, body);
}

export function useUpdateCertification() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: UpdateCertificationBody }) => updateCertification(id, body),
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: [...agencyKeys.all, 'certifications'] });
      void queryClient.invalidateQueries({ queryKey: agencyKeys.users('agency') });
    },
  });
}
