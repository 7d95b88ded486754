import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateRepairCodeBody, RepairCodeItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

export function createRepairCode(body: CreateRepairCodeBody): Promise<RepairCodeItem> {
  return api.post<RepairCodeItem>('/api/admin/repair-codes', body);
}

export function useCreateRepairCode() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createRepairCode,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.repairCodes() }),
  });
}
