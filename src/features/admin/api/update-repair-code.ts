import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { UpdateRepairCodeBody, RepairCodeItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys, enc } from './admin-keys';

export function updateRepairCode(id: string, body: UpdateRepairCodeBody): Promise<RepairCodeItem> {
  return api.patch<RepairCodeItem>(`/api/admin/repair-codes/${enc(id)}`, body);
}

export function useUpdateRepairCode() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: UpdateRepairCodeBody }) => updateRepairCode(id, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.repairCodes() }),
  });
}
