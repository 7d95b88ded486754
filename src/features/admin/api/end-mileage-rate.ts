import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { EndMileageRateBody, MileageRateItem } from '@shared/schemas/mileage-rates';
import { api } from '@/lib/api-client';
import { enc } from './admin-keys';
import { mileageRatesQuery } from './get-mileage-rates';

/** PATCH /api/admin/mileage-rates/:id: the last day a rate is in force. */
export function endMileageRate(id: string, body: EndMileageRateBody): Promise<MileageRateItem> {
  return api.patch<MileageRateItem>(`/api/admin/mileage-rates/${enc(id)}`, body);
}

export function useEndMileageRate() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: EndMileageRateBody }) => endMileageRate(id, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: mileageRatesQuery().queryKey }),
  });
}
