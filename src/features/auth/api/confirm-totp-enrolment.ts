import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MeResponse } from '@shared/schemas/user';
import type { RecoveryCodesResponse } from '@shared/schemas/second-factor';
import { api } from '@/lib/api-client';
import { securityQueries } from './get-security';

export type ConfirmTotpAnswer = RecoveryCodesResponse & Partial<MeResponse>;

/** The first code from the app confirms the secret; the answer carries the recovery codes, shown once (and the session, at sign-in). */
export function confirmTotpEnrolment({ during, code }: { during: 'sign-in' | 'account'; code: string }): Promise<ConfirmTotpAnswer> {
  return api.post<ConfirmTotpAnswer>(during === 'sign-in' ? '/api/auth/second-factor/enrol/totp/confirm' : '/api/account/security/totp/confirm', { code });
}

export function useConfirmTotpEnrolment() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: confirmTotpEnrolment,
    onSuccess: (_a, v) => {
      if (v.during === 'account') void queryClient.invalidateQueries({ queryKey: securityQueries.status().queryKey });
    },
  });
}
