import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PriceHistoryItem } from '@shared/schemas/admin';
import { api } from '@/lib/api-client';
import { adminKeys, enc } from './admin-keys';

/** Every dated list price of a part, oldest first ("0001-01-01": from the start). */
export async function getPriceHistory(id: string, signal?: AbortSignal): Promise<PriceHistoryItem[]> {
  const body = await api.get<{ items: PriceHistoryItem[] }>(`/api/admin/parts/${enc(id)}/prices`, undefined, signal);
  return body.items;
}

export const priceHistoryQuery = (id: string) => queryOptions({ queryKey: adminKeys.partPrices(id), queryFn: ({ signal }) => getPriceHistory(id, signal) });

export function usePriceHistory(id: string) {
  return useQuery(priceHistoryQuery(id));
}
