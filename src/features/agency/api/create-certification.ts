import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CertificationItem, CreateCertificationBody } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { agencyKeys } from './agency-keys';

export function createCertification(body: CreateCertificationBody): Promise<CertificationItem> {
  return api.post<CertificationItem>('/api/agency/certifications', body);
}

export function useCreateCertification() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createCertification,
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: [...agencyKeys.all, 'certifications'] });
      void queryClient.invalidateQueries({ queryKey: agencyKeys.users('agency') });
    },
  });
}
