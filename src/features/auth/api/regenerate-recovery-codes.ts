import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { RecoveryCodesResponse } from '@shared/schemas/second-factor';
import { api } from '@/lib/api-client';
import { securityQueries } from './get-security';

/** A new set of recovery codes; the old ones stop working. Shown once. */
export function regenerateRecoveryCodes(): Promise<RecoveryCodesResponse> {
  return api.post<RecoveryCodesResponse>('/api/account/security/recovery-codes', {});
}

export function useRegenerateRecoveryCodes() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: regenerateRecoveryCodes,
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: securityQueries.status().queryKey }),
  });
}
