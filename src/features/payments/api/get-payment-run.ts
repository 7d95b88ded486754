import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PaymentRunDetail } from '@shared/schemas/payment';
import { api } from '@/lib/api-client';
import { paymentKeys } from './payment-keys';

export function getPaymentRun(id: string, signal?: AbortSignal): Promise<PaymentRunDetail> {
  return api.get<PaymentRunDetail>(`/api/payment-runs/${encodeURIComponent(id)}`, undefined, signal);
}

export function paymentRunQuery(id: string) {
  return queryOptions({ queryKey: paymentKeys.detail(id), queryFn: ({ signal }) => getPaymentRun(id, signal) });
}

export function usePaymentRun(id: string) {
  return useQuery(paymentRunQuery(id));
}
