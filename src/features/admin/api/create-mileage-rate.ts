import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateMileageRateInput, MileageRateItem } from '@shared/schemas/mileage-rates';
import { api } from '@/lib/api-client';
import { mileageRatesQuery } from './get-mileage-rates';

/** POST /api/admin/mileage-rates: a new period of a rate (refused when it overlaps one). */
export function createMileageRate(body: CreateMileageRateInput): Promise<MileageRateItem> {
  return api.post<MileageRateItem>('/api/admin/mileage-rates', body);
}

export function useCreateMileageRate() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createMileageRate,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: mileageRatesQuery().queryKey }),
  });
}
