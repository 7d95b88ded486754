import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ContractTermsItem, CreateTermsBody } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys, enc } from './admin-keys';

export function createTerms(agencyId: string, body: CreateTermsBody): Promise<ContractTermsItem> {
  return api.post<ContractTermsItem>(`/api/admin/agencies/${enc(agencyId)}/terms`, body);
}

export function useCreateTerms() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ agencyId, body }: { agencyId: string; body: CreateTermsBody }) => createTerms(agencyId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.agencies() }),
  });
}
