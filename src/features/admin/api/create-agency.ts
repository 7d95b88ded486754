import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateAgencyBody, AgencyDetail } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

export function createAgency(body: CreateAgencyBody): Promise<AgencyDetail> {
  return api.post<AgencyDetail>('/api/admin/agencies', body);
}

export function useCreateAgency() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createAgency,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.agencies() }),
  });
}
