import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreatePaymentRunInput, PaymentRunDetail } from '@shared/schemas/payment';
import { api } from '@/lib/api-client';
import { paymentKeys } from './payment-keys';

export function createPaymentRun(body: CreatePaymentRunInput): Promise<PaymentRunDetail> {
  return api.post<PaymentRunDetail>('/api/payment-runs', body);
}

export function useCreatePaymentRun() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createPaymentRun,
    onSuccess: (run) => {
      queryClient.setQueryData(paymentKeys.detail(run.id), run);
      void queryClient.invalidateQueries({ queryKey: paymentKeys.all });
      void queryClient.invalidateQueries({ queryKey: ['home'] });
    },
  });
}
