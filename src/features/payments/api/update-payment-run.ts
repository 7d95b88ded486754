import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MarkPaidInput, PaymentRunDetail } from '@shared/schemas/payment';
import { api } from '@/lib/api-client';
import { paymentKeys } from './payment-keys';

export function markPaymentRunPaid(id: string, body: MarkPaidInput): Promise<PaymentRunDetail> {
  return api.post<PaymentRunDetail>(`/api/payment-runs/${encodeURIComponent(id)}/paid`, body);
}

export function voidPaymentRun(id: string): Promise<PaymentRunDetail> {
  return api.post<PaymentRunDetail>(`/api/payment-runs/${encodeURIComponent(id)}/void`);
}

/** After either move the run, the ready list, the claims it held and the home cards change. */
function useRunMutation<V>(fn: (v: V) => Promise<PaymentRunDetail>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: (run) => {
      queryClient.setQueryData(paymentKeys.detail(run.id), run);
      void queryClient.invalidateQueries({ queryKey: paymentKeys.all });
      void queryClient.invalidateQueries({ queryKey: ['claims'] });
      void queryClient.invalidateQueries({ queryKey: ['home'] });
    },
  });
}

export function useMarkPaymentRunPaid(id: string) {
  return useRunMutation((body: MarkPaidInput) => markPaymentRunPaid(id, body));
}

export function useVoidPaymentRun(id: string) {
  return useRunMutation((_: void) => voidPaymentRun(id));
}
