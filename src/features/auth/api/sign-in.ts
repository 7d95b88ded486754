import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { MeResponse, SignInBody } from '@shared/schemas/user';
import type { SecondFactorChallenge } from '@shared/schemas/second-factor';
import { api } from '@/lib/api-client';
import { authQueries } from './get-me';

export type SignInAnswer = MeResponse | SecondFactorChallenge;

export const needsSecondFactor = (a: SignInAnswer): a is SecondFactorChallenge => 'secondFactor' in a;

export function signIn(body: SignInBody): Promise<SignInAnswer> {
  return api.post<SignInAnswer>('/api/auth/sign-in', body);
}

/** Stores the session a sign-in step ended with: whatever another user left in the cache must not be shown to this one. */
export function useStartSession() {
  const queryClient = useQueryClient();
  return (me: MeResponse) => {
    queryClient.clear();
    queryClient.setQueryData(authQueries.me().queryKey, me);
  };
}

export function useSignIn({ onSuccess, onSecondFactor }: { onSuccess?: (me: MeResponse) => void; onSecondFactor?: (c: SecondFactorChallenge) => void } = {}) {
  const start = useStartSession();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (answer) => {
      if (needsSecondFactor(answer)) {
        onSecondFactor?.(answer);
        return;
      }
      start(answer);
      onSuccess?.(answer);
    },
  });
}
