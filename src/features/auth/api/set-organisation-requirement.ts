import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { securityQueries } from './get-security';

/** An organisation admin requires (or stops requiring) a second factor for every user of the organisation. */
export function setOrganisationRequirement(body: { requireSecondFactor: boolean }): Promise<{ requireSecondFactor: boolean }> {
  return api.put<{ requireSecondFactor: boolean }>('/api/account/security/organisation', body);
}

export function useSetOrganisationRequirement() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: setOrganisationRequirement,
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: securityQueries.status().queryKey }),
  });
}
