import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { securityQueries } from './get-security';

/** Removes the authenticator app (a sensitive change: the server may ask to confirm it is still the user). */
export function removeTotp(): Promise<void> {
  return api.delete<void>('/api/account/security/totp');
}

export function useRemoveTotp() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: removeTotp,
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: securityQueries.status().queryKey }),
  });
}
