import { useMutation } from '@tanstack/react-query';
import { startAuthentication, type PublicKeyCredentialRequestOptionsJSON } from '@simplewebauthn/browser';
import type { MeResponse } from '@shared/schemas/user';
import { api } from '@/lib/api-client';

/** The sign-in's second step with a passkey: options (challenge) from the server, the browser signs, the server checks. */
export async function signInWithPasskey(): Promise<MeResponse> {
  const optionsJSON = await api.post<PublicKeyCredentialRequestOptionsJSON>('/api/auth/second-factor/passkey/options', {});
  const response = await startAuthentication({ optionsJSON });
  return api.post<MeResponse>('/api/auth/second-factor/passkey', { response });
}

export function useSignInWithPasskey() {
  return useMutation({ mutationFn: signInWithPasskey });
}
