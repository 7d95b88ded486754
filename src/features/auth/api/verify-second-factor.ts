import { useMutation } from '@tanstack/react-query';
import type { MeResponse } from '@shared/schemas/user';
import { api } from '@/lib/api-client';

/** The sign-in's second step: a code from the authenticator app, or one recovery code. */
export function verifySecondFactor({ method, code }: { method: 'totp' | 'recovery'; code: string }): Promise<MeResponse> {
  return api.post<MeResponse>(`/api/auth/second-factor/${method}`, { code });
}

export function useVerifySecondFactor() {
  return useMutation({ mutationFn: verifySecondFactor });
}
