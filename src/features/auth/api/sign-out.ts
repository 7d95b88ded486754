import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export function signOut(): Promise<void> {
  return api.post<void>('/api/auth/sign-out');
}

export function useSignOut({ onSettled }: { onSettled?: () => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    // Signed out or not on the server, nothing of this session stays in the browser.
    onSettled: () => {
      queryClient.clear();
      onSettled?.();
    },
  });
}
