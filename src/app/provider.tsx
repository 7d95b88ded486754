import type { ReactNode } from 'react';
import { QueryClientProvider, useQuery, type QueryClient } from '@tanstack/react-query';
import { SessionAbilityProvider } from '@/lib/ability';
import { authQueries } from '@/features/auth/api/get-me';

function SessionAbility({ children }: { children: ReactNode }) {
  const me = useQuery(authQueries.me());
  return <SessionAbilityProvider rules={me.data?.rules}>{children}</SessionAbilityProvider>;
}

/** The query cache and the signed-in user's CASL ability, around the whole app. */
export function AppProvider({ queryClient, children }: { queryClient: QueryClient; children: ReactNode }) {
  return (
    <QueryClientProvider client={queryClient}>
      <SessionAbility>{children}</SessionAbility>
    </QueryClientProvider>
  );
}
