import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateReadingSpecBody, ReadingSpecItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys, enc } from './admin-keys';

export function createReadingSpec(id: string, body: CreateReadingSpecBody): Promise<ReadingSpecItem> {
  return api.post<ReadingSpecItem>(`/api/admin/models/${enc(id)}/reading-specs`, body);
}

export function useCreateReadingSpec() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: CreateReadingSpecBody }) => createReadingSpec(id, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.models() }),
  });
}
