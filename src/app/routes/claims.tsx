import { useMemo, useRef } from 'react';
import { Link, useLocation, useNavigate, useSearchParams, type LoaderFunctionArgs } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { subject } from '@casl/ability';
import { claimStates, type ClaimListItem } from '@shared/schemas/claim';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/empty-state';
import { paths } from '@/config/paths';
import { useAppAbility } from '@/lib/ability';
import { errorMessage } from '@/lib/api-client';
import { plural } from '@/lib/format';
import { useSession } from '@/features/auth/api/get-me';
import { loadOrSignIn, requireSession } from '../require-session';
import { claimQueries } from '@/features/claims/api/claim-queries';
import { useClaims } from '@/features/claims/api/get-claims';
import { ClaimFilterBar, type AgencyOption } from '@/features/claims/components/claim-filter-bar';
import { ClaimsPager } from '@/features/claims/components/claims-pager';
import { NewClaimButton } from '@/features/claims/components/new-claim-button';
import { ClaimsTable, ClaimsTableSkeleton } from '@/features/claims/components/claims-table';
import { CLAIMS_PAGE_SIZE, filtersToParams, hasNarrowingFilters, parseClaimFilters, type ClaimFilters } from '@/features/claims/filters';

export const claimsLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requireSession(queryClient, request);
    const filters = parseClaimFilters(new URL(request.url).searchParams);
    // Errors other than a lost session are shown beside the filters.
    await loadOrSignIn(queryClient, request, () => queryClient.ensureQueryData(claimQueries.list(filters)));
    return null;
  };

/** Cursors of the pages before this one, kept in the history entry so Back and Previous agree. */
interface PagingState {
  cursors?: string[];
}

/**
 * The agencies a manufacturer user can filter by: every agency seen in the claims loaded
 * this visit (the API offers reviewers no agency list of its own).
 */
function useKnownAgencies(enabled: boolean, items: ClaimListItem[] | undefined, selected: string | undefined): AgencyOption[] | null {
  const seen = useRef(new Map<string, string>());
  for (const c of items ?? []) seen.current.set(c.agencyId, c.agencyName);
  if (!enabled) return null;
  const byId = new Map<string, string>(seen.current);
  if (selected && !byId.has(selected)) byId.set(selected, 'Chosen agency');
  return [...byId].map(([id, name]) => ({ id, name })).sort((a, b) => a.name.localeCompare(b.name));
}

export function ClaimsRoute() {
  const [params] = useSearchParams();
  const location = useLocation();
  const navigate = useNavigate();
  const filters = useMemo(() => parseClaimFilters(params), [params]);
  const me = useSession();
  const ability = useAppAbility();
  const claims = useClaims(filters);
  const isManufacturer = me?.organisation.kind === 'manufacturer';
  const agencies = useKnownAgencies(isManufacturer, claims.data?.items, filters.agency);

  const cursors = (location.state as PagingState | null)?.cursors ?? [];
  const go = (next: ClaimFilters, state: PagingState | null) => {
    const qs = filtersToParams(next).toString();
    navigate({ pathname: paths.claims, search: qs ? `?${qs}` : '' }, { state });
  };

  const visibleStates = claimStates.filter((s) =>
    ability.can('read', subject('Claim', { state: s, agencyId: me?.organisation.id, technicianId: me?.user.id })),
  );
  const isReviewQueue = filters.state === 'submitted' && ability.can('start_review', 'Claim');
  const title = isReviewQueue ? 'Review queue' : 'Claims';
  const page = claims.data;
  const busy = claims.isFetching && claims.isPlaceholderData;

  return (
    <div className="space-y-4">
      <title>{`${title} · Fieldproof`}</title>
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h1 className="text-2xl font-semibold text-ink-900">{title}</h1>
        <div className="flex items-center gap-4">
          {page && <p className="text-sm text-ink-600">{plural(page.total, 'claim')}</p>}
          <NewClaimButton />
        </div>
      </div>
      {isReviewQueue && <p className="text-sm text-ink-700">Submitted claims waiting for a reviewer to start. Open one to review it.</p>}

      <Card className="p-4">
        <ClaimFilterBar filters={filters} agencies={agencies} states={visibleStates} onChange={(next) => go(next, null)} />
      </Card>

      <Card aria-labelledby="claims-results" aria-busy={busy || claims.isPending || undefined}>
        <h2 id="claims-results" className="sr-only">
          Results
        </h2>
        {claims.isError && (
          <div className="p-4">
            <Alert tone="error" title="The claims could not be loaded">
              <p>{errorMessage(claims.error)}</p>
              <Button variant="secondary" size="sm" className="mt-2" onClick={() => claims.refetch()}>
                Try again
              </Button>
            </Alert>
          </div>
        )}
        {claims.isPending && (
          <>
            <p className="sr-only" role="status">
              Loading claims…
            </p>
            <ClaimsTableSkeleton />
          </>
        )}
        {page && page.items.length === 0 && (
          <EmptyState title={hasNarrowingFilters(filters) ? 'No claims match these filters' : 'No claims yet'}>
            {hasNarrowingFilters(filters) ? (
              <Link to={paths.claims} className="text-ink-700 underline underline-offset-2">
                Show all claims
              </Link>
            ) : (
              'Claims appear here once they are filed.'
            )}
          </EmptyState>
        )}
        {page && page.items.length > 0 && (
          <div className={busy ? 'opacity-60 transition-opacity' : undefined}>
            <ClaimsTable
              items={page.items}
              sort={filters.sort}
              dir={filters.dir}
              showAgency={isManufacturer}
              onSort={(s) => go({ ...filters, ...s, cursor: undefined }, null)}
            />
            <ClaimsPager
              pageNumber={filters.cursor && cursors.length === 0 ? null : cursors.length + 1}
              pageSize={CLAIMS_PAGE_SIZE}
              shown={page.items.length}
              total={page.total}
              hasPrevious={Boolean(filters.cursor)}
              hasNext={Boolean(page.nextCursor)}
              busy={busy}
              onNext={() => page.nextCursor && go({ ...filters, cursor: page.nextCursor }, { cursors: [...cursors, filters.cursor ?? ''] })}
              onPrevious={() => {
                const previous = cursors.at(-1);
                go({ ...filters, cursor: previous || undefined }, { cursors: cursors.slice(0, -1) });
              }}
            />
          </div>
        )}
      </Card>
    </div>
  );
}
