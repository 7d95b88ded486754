import type { LoaderFunctionArgs } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { roleLabels } from '@shared/permissions/ability';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { Skeleton } from '@/components/ui/skeleton';
import { errorMessage } from '@/lib/api-client';
import { NewClaimButton } from '@/features/claims/components/new-claim-button';
import { useSession } from '@/features/auth/api/get-me';
import { loadOrSignIn, requireSession } from '../require-session';
import { homeQueries, useHome } from '@/features/home/api/get-home';
import { HomeCard } from '@/features/home/components/home-card';
import { HomeNotices } from '@/features/home/components/home-notices';

export const homeLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  await requireSession(queryClient, request);
  await loadOrSignIn(queryClient, request, () => queryClient.ensureQueryData(homeQueries.home()));
  return null;
};

function greeting(now: Date): string {
  const h = now.getHours();
  return h < 12 ? 'Good morning' : h < 18 ? 'Good afternoon' : 'Good evening';
}

export function HomeRoute() {
  const me = useSession();
  const home = useHome();
  const firstName = me?.user.name.split(' ')[0];
  return (
    <div className="space-y-5">
      <title>Home · Fieldproof</title>
      <div className="flex flex-wrap items-start justify-between gap-3">
      <div>
        <h1 className="text-2xl font-semibold text-ink-900">
          {greeting(new Date())}
          {firstName ? `, ${firstName}` : ''}
        </h1>
        {me && (
          <p className="text-sm text-ink-600">
            {roleLabels[me.user.role]} at {me.organisation.name} · what needs your action now
          </p>
        )}
      </div>
      <NewClaimButton />
      </div>
      {home.isError && (
        <Alert tone="error" title="Your queues could not be loaded">
          <p>{errorMessage(home.error)}</p>
          <Button variant="secondary" size="sm" className="mt-2" onClick={() => home.refetch()}>
            Try again
          </Button>
        </Alert>
      )}
      {home.isPending && (
        <div className="grid gap-4 sm:grid-cols-2 xl:grid-cols-3" aria-hidden="true">
          {[0, 1, 2].map((i) => (
            <Skeleton key={i} className="h-48 rounded-lg" />
          ))}
        </div>
      )}
      {home.data && (
        <>
          <HomeNotices notices={home.data.notices} />
          {home.data.cards.length === 0 ? (
            <EmptyState title="Nothing needs you right now">New work shows up here as soon as it arrives.</EmptyState>
          ) : (
            <div className="grid gap-4 sm:grid-cols-2 xl:grid-cols-3">
              {home.data.cards.map((card) => (
                <HomeCard key={card.key} card={card} showAgency={me?.organisation.kind !== 'agency'} />
              ))}
            </div>
          )}
        </>
      )}
    </div>
  );
}
