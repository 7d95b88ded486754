import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { UpdateFamilyBody, FamilyItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys, enc } from './admin-keys';

export function updateFamily(id: string, body: UpdateFamilyBody): Promise<FamilyItem> {
  return api.patch<FamilyItem>(`/api/admin/families/${enc(id)}`, body);
}

export function useUpdateFamily() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: UpdateFamilyBody }) => updateFamily(id, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.families() }),
  });
}
