import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

/** Confirms it is still the user (password or authenticator code); the session counts as freshly signed in for 5 minutes. */
export function stepUp(body: { password: string } | { code: string }): Promise<void> {
  return api.post<void>('/api/auth/step-up', body);
}

export function useStepUp() {
  return useMutation({ mutationFn: stepUp });
}
