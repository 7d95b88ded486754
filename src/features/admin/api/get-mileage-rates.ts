import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MileageRatesList } from '@shared/schemas/mileage-rates';
import { api } from '@/lib/api-client';
import { adminKeys } from './admin-keys';

/** GET /api/admin/mileage-rates: the dated rates by currency and first day, with the days no rate covers. */
export function getMileageRates(signal?: AbortSignal): Promise<MileageRatesList> {
  return api.get<MileageRatesList>('/api/admin/mileage-rates', undefined, signal);
}

export const mileageRatesQuery = () => queryOptions({ queryKey: [...adminKeys.all, 'mileage-rates'] as const, queryFn: ({ signal }) => getMileageRates(signal) });

export function useMileageRates() {
  return useQuery(mileageRatesQuery());
}
