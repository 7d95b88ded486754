import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateFamilyBody, FamilyItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

export function createFamily(body: CreateFamilyBody): Promise<FamilyItem> {
  return api.post<FamilyItem>('/api/admin/families', body);
}

export function useCreateFamily() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createFamily,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.families() }),
  });
}
