import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MeResponse, SignInBody } from '@shared/schemas/user';
import { api } from '@/lib/api-client';
import { authQueries } from './get-me';

export function signIn(body: SignInBody): Promise<MeResponse> {
  return api.post<MeResponse>('/api/auth/sign-in', body);
}

export function useSignIn({ onSuccess }: { onSuccess?: (me: MeResponse) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (me) => {
      // Whatever another user left in the cache must not be shown to this one.
      queryClient.clear();
      queryClient.setQueryData(authQueries.me().queryKey, me);
      onSuccess?.(me);
    },
  });
}
