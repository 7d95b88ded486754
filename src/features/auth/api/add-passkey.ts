import { useMutation, useQueryClient } from '@tanstack/react-query';
import { startRegistration, type PublicKeyCredentialCreationOptionsJSON } from '@simplewebauthn/browser';
import { api } from '@/lib/api-client';
import { securityQueries } from './get-security';

export interface AddPasskeyAnswer {
  id: string;
  /** New recovery codes when the account had none left; shown once. */
  recoveryCodes: string[];
}

/** Registers a passkey (WebAuthn): options with a challenge from the server, the browser creates the credential, the server checks and stores it. */
export async function addPasskey({ name }: { name?: string }): Promise<AddPasskeyAnswer> {
  const optionsJSON = await api.post<PublicKeyCredentialCreationOptionsJSON>('/api/account/security/passkeys/options', {});
  const response = await startRegistration({ optionsJSON });
  return api.post<AddPasskeyAnswer>('/api/account/security/passkeys', { response, ...(name?.trim() ? { name: name.trim() } : {}) });
}

export function useAddPasskey() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: addPasskey,
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: securityQueries.status().queryKey }),
  });
}
