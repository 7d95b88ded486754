import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export function requestPasswordReset(body: { email: string }): Promise<void> {
  return api.post<void>('/api/auth/password-reset', body);
}

export function useRequestPasswordReset() {
  return useMutation({ mutationFn: requestPasswordReset });
}
