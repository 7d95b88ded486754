import type { ReactNode } from 'react';
import { QueryClientProvider, type QueryClient } from '@tanstack/react-query';
import { SessionAbilityProvider } from '@/lib/ability';
import { OrganisationTimeZoneProvider } from '@/lib/business-day';
import { useSession } from '@/features/auth/api/get-me';
import { StepUpDialog } from '@/features/auth/components/step-up-dialog';

function SessionAbility({ children }: { children: ReactNode }) {
  const session = useSession();
  return (
    <SessionAbilityProvider rules={session?.rules}>
      <OrganisationTimeZoneProvider timeZone={session?.organisation.timeZone}>{children}</OrganisationTimeZoneProvider>
    </SessionAbilityProvider>
  );
}

/** The query cache and the signed-in user's CASL ability, around the whole app. */
export function AppProvider({ queryClient, children }: { queryClient: QueryClient; children: ReactNode }) {
  return (
    <QueryClientProvider client={queryClient}>
      <SessionAbility>{children}</SessionAbility>
      <StepUpDialog />
    </QueryClientProvider>
  );
}
