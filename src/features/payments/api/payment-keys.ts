import type { PaymentRunState } from '@shared/schemas/payment';

/** Query keys of the payments feature; invalidating ['payment-runs'] refreshes runs and the ready list. */
export const paymentKeys = {
  all: ['payment-runs'] as const,
  ready: () => [...paymentKeys.all, 'ready'] as const,
  lists: () => [...paymentKeys.all, 'list'] as const,
  list: (state: PaymentRunState | undefined) => [...paymentKeys.lists(), { state: state ?? null }] as const,
  details: () => [...paymentKeys.all, 'detail'] as const,
  detail: (id: string) => [...paymentKeys.details(), id] as const,
};
