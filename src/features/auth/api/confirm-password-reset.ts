import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export function confirmPasswordReset(body: { token: string; password: string }): Promise<void> {
  return api.post<void>('/api/auth/password-reset/confirm', body);
}

export function useConfirmPasswordReset() {
  return useMutation({ mutationFn: confirmPasswordReset });
}
