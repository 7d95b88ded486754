import { useMemo, useRef, useState } from 'react';
import { useLocation, useNavigate, useSearchParams, type LoaderFunctionArgs } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { subject } from '@casl/ability';
import type { ClaimListItem } from '@shared/schemas/claim';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/empty-state';
import { Spinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { useAppAbility } from '@/lib/ability';
import { errorMessage } from '@/lib/api-client';
import { plural } from '@/lib/format';
import { useSession } from '@/features/auth/api/get-me';
import { reviewQueueQuery, useReviewQueue } from '@/features/review/api/get-review-queue';
import { useModels } from '@/features/review/api/get-models';
import { useStartReview } from '@/features/review/api/start-review';
import { ReviewQueueFilterBar, type AgencyOption } from '@/features/review/components/review-queue-filters';
import { ReviewQueueTable } from '@/features/review/components/review-queue-table';
import { parseQueueFilters, queueFiltersToParams, type ReviewQueueFilters } from '@/features/review/queue-filters';
import { loadOrSignIn, requireSession } from '../require-session';

export const reviewQueueLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requireSession(queryClient, request);
    const filters = parseQueueFilters(new URL(request.url).searchParams);
    await loadOrSignIn(queryClient, request, () => queryClient.ensureQueryData(reviewQueueQuery(filters)));
    return null;
  };

/** Agencies seen in the queue this visit (reviewers have no agency list of their own). */
function useSeenAgencies(items: ClaimListItem[] | undefined, selected: string | undefined): AgencyOption[] {
  const seen = useRef(new Map<string, string>());
  for (const c of items ?? []) seen.current.set(c.agencyId, c.agencyName);
  const all = new Map(seen.current);
  if (selected && !all.has(selected)) all.set(selected, 'Chosen agency');
  return [...all].map(([id, name]) => ({ id, name })).sort((a, b) => a.name.localeCompare(b.name));
}

interface PagingState {
  cursors?: string[];
}

/** /review: submitted and in-review claims, oldest first, with who has each one. */
export function ReviewQueueRoute() {
  const [params] = useSearchParams();
  const filters = useMemo(() => parseQueueFilters(params), [params]);
  const navigate = useNavigate();
  const location = useLocation();
  const ability = useAppAbility();
  const me = useSession();
  const queue = useReviewQueue(filters);
  const models = useModels();
  const start = useStartReview();
  const [startingId, setStartingId] = useState<string | null>(null);
  const [startError, setStartError] = useState<string | null>(null);
  const agencies = useSeenAgencies(queue.data?.items, filters.agency);
  const cursors = (location.state as PagingState | null)?.cursors ?? [];

  const go = (next: ReviewQueueFilters, state: PagingState | null = null) => {
    const qs = queueFiltersToParams(next).toString();
    navigate({ pathname: paths.reviewQueue, search: qs ? `?${qs}` : '' }, { state });
  };

  const onStart = (c: ClaimListItem) => {
    setStartError(null);
    setStartingId(c.id);
    start.mutate(c.id, {
      onSuccess: (claim) => navigate(paths.claim(claim.id)),
      onError: (e) => setStartError(errorMessage(e)),
      onSettled: () => setStartingId(null),
    });
  };

  const page = queue.data;
  return (
    <div className="space-y-4">
      <title>Review queue · Fieldproof</title>
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h1 className="text-2xl font-semibold text-ink-900">Review queue</h1>
        {page && <p className="text-sm text-ink-600">{plural(page.total, 'claim')}</p>}
      </div>
      <p className="text-sm text-ink-700">Oldest submissions first. Start a review to take a claim: the others see that you have it.</p>
      <Card className="p-4">
        <ReviewQueueFilterBar filters={filters} agencies={agencies} models={models.data?.items ?? []} onChange={(next) => go(next)} />
      </Card>
      {startError && (
        <Alert tone="warning" title="The review could not be started">
          {startError}
        </Alert>
      )}
      <Card aria-labelledby="queue-results" aria-busy={queue.isFetching || undefined}>
        <h2 id="queue-results" className="sr-only">
          Claims
        </h2>
        {queue.isPending && (
          <div className="p-4">
            <Spinner label="Loading the queue…" />
          </div>
        )}
        {queue.isError && (
          <div className="p-4">
            <Alert tone="error" title="The queue could not be loaded">
              <p>{errorMessage(queue.error)}</p>
              <Button variant="secondary" size="sm" className="mt-2" onClick={() => queue.refetch()}>
                Try again
              </Button>
            </Alert>
          </div>
        )}
        {page && page.items.length === 0 && <EmptyState title="Nothing waiting">No submitted or in-review claims match these filters.</EmptyState>}
        {page && page.items.length > 0 && (
          <>
            <ReviewQueueTable
              items={page.items}
              myName={me?.user.name}
              canStart={(c) => c.state === 'submitted' && ability.can('start_review', subject('Claim', { ...c }))}
              startingId={startingId}
              onStart={onStart}
            />
            {(filters.cursor || page.nextCursor) && (
              <div className="flex justify-between gap-2 border-t border-ink-100 px-4 py-3">
                <Button
                  variant="secondary"
                  size="sm"
                  disabled={!filters.cursor}
                  onClick={() => {
                    const previous = cursors.at(-1);
                    go({ ...filters, cursor: previous || undefined }, { cursors: cursors.slice(0, -1) });
                  }}
                >
                  Previous
                </Button>
                <Button variant="secondary" size="sm" disabled={!page.nextCursor} onClick={() => page.nextCursor && go({ ...filters, cursor: page.nextCursor }, { cursors: [...cursors, filters.cursor ?? ''] })}>
                  Next
                </Button>
              </div>
            )}
          </>
        )}
      </Card>
    </div>
  );
}
