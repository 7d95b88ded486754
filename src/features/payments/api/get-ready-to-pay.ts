import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ReadyToPayResponse } from '@shared/schemas/payment';
import { api } from '@/lib/api-client';
import { paymentKeys } from './payment-keys';

export function getReadyToPay(signal?: AbortSignal): Promise<ReadyToPayResponse> {
  return api.get<ReadyToPayResponse>('/api/payment-runs/ready', undefined, signal);
}

export function readyToPayQuery() {
  return queryOptions({ queryKey: paymentKeys.ready(), queryFn: ({ signal }) => getReadyToPay(signal) });
}

export function useReadyToPay() {
  return useQuery(readyToPayQuery());
}
