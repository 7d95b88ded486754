import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PaymentRunPage, PaymentRunState } from '@shared/schemas/payment';
import { api } from '@/lib/api-client';
import { paymentKeys } from './payment-keys';

export function getPaymentRuns(state: PaymentRunState | undefined, signal?: AbortSignal): Promise<PaymentRunPage> {
  return api.get<PaymentRunPage>('/api/payment-runs', { state, limit: 200 }, signal);
}

export function paymentRunsQuery(state?: PaymentRunState) {
  return queryOptions({ queryKey: paymentKeys.list(state), queryFn: ({ signal }) => getPaymentRuns(state, signal) });
}

export function usePaymentRuns(state?: PaymentRunState) {
  return useQuery(paymentRunsQuery(state));
}
