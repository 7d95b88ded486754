import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { PartReturnsResponse, ReceiptInput, ShipmentInput, WaiverInput } from '@shared/schemas/payment';
import { api } from '@/lib/api-client';

export const partReturnKeys = {
  all: ['part-returns'] as const,
  claim: (claimId: string) => [...partReturnKeys.all, claimId] as const,
};

const base = (claimId: string) => `/api/claims/${encodeURIComponent(claimId)}/part-returns`;

export function getPartReturns(claimId: string, signal?: AbortSignal): Promise<PartReturnsResponse> {
  return api.get<PartReturnsResponse>(base(claimId), undefined, signal);
}

export function partReturnsQuery(claimId: string) {
  return queryOptions({ queryKey: partReturnKeys.claim(claimId), queryFn: ({ signal }) => getPartReturns(claimId, signal) });
}

export function usePartReturns(claimId: string, enabled = true) {
  return useQuery({ ...partReturnsQuery(claimId), enabled });
}

export type PartReturnStep =
  | { action: 'ship'; lineId: string; body: ShipmentInput }
  | { action: 'receive'; lineId: string; body: ReceiptInput }
  | { action: 'waive'; lineId: string; body: WaiverInput };

const endpoint = { ship: 'shipment', receive: 'receipt', waive: 'waiver' } as const;

export function recordPartReturnStep(claimId: string, step: PartReturnStep): Promise<PartReturnsResponse> {
  return api.post<PartReturnsResponse>(`${base(claimId)}/${encodeURIComponent(step.lineId)}/${endpoint[step.action]}`, step.body);
}

/** A recorded step changes the claim (version, timeline), whether it is ready to pay, and the home cards. */
export function useRecordPartReturnStep(claimId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (step: PartReturnStep) => recordPartReturnStep(claimId, step),
    onSuccess: (data) => {
      queryClient.setQueryData(partReturnKeys.claim(claimId), data);
      void queryClient.invalidateQueries({ queryKey: ['claims', 'detail', claimId] });
      void queryClient.invalidateQueries({ queryKey: ['payment-runs'] });
      void queryClient.invalidateQueries({ queryKey: ['home'] });
    },
  });
}
