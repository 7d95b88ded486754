import { useMutation } from '@tanstack/react-query';
import type { TotpSetupResponse } from '@shared/schemas/second-factor';
import { api } from '@/lib/api-client';

/**
 * A new authenticator secret with its QR code. `during: 'sign-in'` for an account that must enrol
 * before its first session; `'account'` from the account security page.
 */
export function startTotpEnrolment(during: 'sign-in' | 'account'): Promise<TotpSetupResponse> {
  return api.post<TotpSetupResponse>(during === 'sign-in' ? '/api/auth/second-factor/enrol/totp' : '/api/account/security/totp', {});
}

export function useStartTotpEnrolment(during: 'sign-in' | 'account') {
  return useMutation({ mutationFn: () => startTotpEnrolment(during) });
}
