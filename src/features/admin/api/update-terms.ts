import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ContractTermsItem, UpdateTermsBody } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys, enc } from './admin-keys';

export function updateTerms(agencyId: string, termsId: string, body: UpdateTermsBody): Promise<ContractTermsItem> {
  return api.patch<ContractTermsItem>(`/api/admin/agencies/${enc(agencyId)}/terms/${enc(termsId)}`, body);
}

export function useUpdateTerms() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ agencyId, termsId, body }: { agencyId: string; termsId: string; body: UpdateTermsBody }) => updateTerms(agencyId, termsId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.agencies() }),
  });
}
