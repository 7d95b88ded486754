import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { securityQueries } from './get-security';

/** Removes one of the user's passkeys (a sensitive change: the server may ask to confirm it is still the user). */
export function removePasskey(id: string): Promise<void> {
  return api.delete<void>(`/api/account/security/passkeys/${encodeURIComponent(id)}`);
}

export function useRemovePasskey() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: removePasskey,
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: securityQueries.status().queryKey }),
  });
}
