import { Link, isRouteErrorResponse, redirect, useParams, useRouteError, type LoaderFunctionArgs } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { subject } from '@casl/ability';
import { abilityFromRules } from '@shared/permissions/ability';
import { reasonLabel } from '@shared/workflow/reason-codes';
import type { ClaimDetail } from '@shared/schemas/claim';
import { flagLabel } from '@shared/calculations/flags';
import { Alert } from '@/components/ui/alert';
import { ButtonLink } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { useAppAbility } from '@/lib/ability';
import { errorMessage, isApiError } from '@/lib/api-client';
import { formatCents, formatDateTime, plural } from '@/lib/format';
import { claimQueries } from '@/features/claims/api/claim-queries';
import { useClaim } from '@/features/claims/api/get-claim';
import { useClaimValuation } from '@/features/claims/api/get-claim-valuation';
import { ClaimLines } from '@/features/claims/components/claim-lines';
import { ClaimStateBadge } from '@/features/claims/components/claim-state-badge';
import { ClaimDatesCard, ClaimSiteCard, ClaimStory, ClaimUnitCard } from '@/features/claims/components/claim-summary';
import { ClaimActionsBar } from '@/features/claims/components/claim-actions-bar';
import { ValuationBreakdown } from '@/features/claims/components/valuation-breakdown';
import { PartReturnsPanel } from '@/features/part-returns/components/part-returns-panel';
import { AdjustmentsPanel } from '@/features/review/components/adjustments-panel';
import { TakeOverPanel } from '@/features/review/components/take-over-panel';
import { SubmissionChangesPanel, UnitClaimsPanel } from '@/features/review/components/claim-history-panels';
import { ClaimActivity } from '@/features/comments/components/claim-activity';
import { EvidencePanel } from '@/features/evidence/components/evidence-panel';
import { ReadingsPanel } from '@/features/evidence/components/readings-panel';
import { loadOrSignIn, requireSession } from '../require-session';

export const claimLoader =
  (queryClient: QueryClient) =>
  async ({ params, request }: LoaderFunctionArgs) => {
    const me = await requireSession(queryClient, request);
    const id = params.id ?? '';
    // The valuation is computed on the server and may take longer: it loads beside the page.
    void queryClient.prefetchQuery(claimQueries.valuation(id));
    await loadOrSignIn(queryClient, request, () => queryClient.ensureQueryData(claimQueries.detail(id)), { rethrow: true });
    // A draft is worked on in its editor: whoever may edit it goes straight there.
    const claim = queryClient.getQueryData<ClaimDetail>(claimQueries.detail(id).queryKey);
    if (claim?.state === 'draft' && abilityFromRules(me.rules).can('update', subject('Claim', { ...claim }))) throw redirect(paths.claimEdit(id));
    return null;
  };

function BackToClaims() {
  return (
    <Link to={paths.claims} className="inline-flex items-center gap-1 text-sm text-ink-700 underline-offset-2 hover:underline">
      <span aria-hidden="true">←</span> Claims
    </Link>
  );
}

function ClaimHeading({ claim }: { claim: ClaimDetail }) {
  return (
    <div className="flex flex-wrap items-end justify-between gap-4">
      <div>
        <div className="flex flex-wrap items-center gap-3">
          <h1 className="font-mono text-2xl font-semibold text-ink-900">{claim.number}</h1>
          <ClaimStateBadge state={claim.state} />
        </div>
        <p className="mt-1 text-sm text-ink-700">
          {claim.agencyName} · {claim.technicianName}
          {claim.unit && ` · ${claim.unit.model.modelNumber} serial ${claim.unit.serial}`}
        </p>
        {claim.flags.length > 0 && (
          <ul className="mt-2 flex flex-wrap gap-2" aria-label="Flags">
            {claim.flags.map((f) => (
              <li key={f} className="rounded-full bg-brass-100 px-2 py-0.5 text-xs font-medium text-brass-700">
                {flagLabel(f)}
              </li>
            ))}
          </ul>
        )}
      </div>
      <dl className="flex gap-6 text-right">
        <div>
          <dt className="text-xs uppercase tracking-wide text-ink-600">Allowed</dt>
          <dd className="text-xl font-semibold tabular-nums">{formatCents(claim.claimedTotalCents, claim.currency)}</dd>
        </div>
        <div>
          <dt className="text-xs uppercase tracking-wide text-ink-600">Approved</dt>
          <dd className="text-xl font-semibold tabular-nums">{formatCents(claim.approvedTotalCents, claim.currency)}</dd>
        </div>
      </dl>
    </div>
  );
}

/** Where the claim stands for the people who act on it next: the reviewer's reason, the approval, who reviews it. */
function ClaimStatusNote({ claim }: { claim: ClaimDetail }) {
  const lastOf = (type: string) => [...claim.events].filter((e) => e.type === type).sort((a, b) => b.at.localeCompare(a.at))[0];
  if (claim.state === 'returned') {
    const r = lastOf('return');
    return (
      <Alert tone="warning" title={`Returned to the agency${r?.reason ? `: ${reasonLabel(r.reason)}` : ''}`}>
        {r?.comment && <p className="whitespace-pre-line">{r.comment}</p>}
        <p className="mt-1 text-xs">
          {r ? `${r.actorName ?? 'Reviewer'} · ${formatDateTime(r.at)} · ` : ''}
          {claim.resubmissionCount > 0 ? `resubmitted ${plural(claim.resubmissionCount, 'time')} so far` : 'not resubmitted yet'}
        </p>
      </Alert>
    );
  }
  if (claim.state === 'approved' || claim.state === 'paid') {
    return (
      <Alert tone="success" title={`Approved: ${formatCents(claim.approvedTotalCents, claim.currency)}`}>
        {claim.state === 'paid' ? `Paid ${formatDateTime(claim.paidAt)}.` : `Decided ${formatDateTime(claim.decidedAt)}${claim.decidedByName ? ` by ${claim.decidedByName}` : ''}; it is paid in the next payment run.`}
      </Alert>
    );
  }
  if (claim.state === 'denied') {
    const d = lastOf('deny');
    return (
      <Alert tone="error" title={`Denied${d?.reason ? `: ${reasonLabel(d.reason)}` : ''}`}>
        {d?.comment && <p className="whitespace-pre-line">{d.comment}</p>}
      </Alert>
    );
  }
  if (claim.state === 'in_review') {
    return (
      <div className="space-y-2">
        <p className="text-sm text-ink-700">In review{claim.heldByYou ? ' with you' : claim.reviewerName ? ` with ${claim.reviewerName}` : ''}.</p>
        {claim.firstApproval && (
          <Alert tone="info" title={`First approval: ${formatCents(claim.firstApproval.approvedTotalCents, claim.currency)}`}>
            {claim.firstApproval.byYou
              ? 'You approved above your approval limit; a second reviewer confirms.'
              : `${claim.firstApproval.byName} approved above their approval limit on ${formatDateTime(claim.firstApproval.at)}; a second reviewer confirms with Approve.`}
          </Alert>
        )}
      </div>
    );
  }
  if (claim.state === 'submitted') return <p className="text-sm text-ink-700">Submitted{claim.resubmissionCount > 0 ? ` again (resubmission ${claim.resubmissionCount})` : ''}; waiting for a reviewer to start.</p>;
  return null;
}

function ValuationSection({ claimId }: { claimId: string }) {
  const valuation = useClaimValuation(claimId);
  if (valuation.data) return <ValuationBreakdown valuation={valuation.data} />;
  return (
    <Card aria-labelledby="claim-valuation">
      <CardHeader id="claim-valuation" title="Valuation" />
      <CardBody className="text-sm text-ink-700">
        {valuation.isPending ? (
          <Spinner label="Computing the valuation…" />
        ) : (
          <p>
            The computed breakdown is not available yet.{isApiError(valuation.error) && valuation.error.status !== 404 ? ` ${errorMessage(valuation.error)}` : ''} The totals
            above are the amounts stored on the claim.
          </p>
        )}
      </CardBody>
    </Card>
  );
}

export function ClaimRoute() {
  const { id = '' } = useParams();
  const claim = useClaim(id);
  const valuation = useClaimValuation(id);
  const ability = useAppAbility();
  if (!claim.data) {
    return claim.isError ? <ClaimError error={claim.error} /> : <Spinner label="Loading the claim…" />;
  }
  const c = claim.data;
  const may = (action: 'update' | 'adjust' | 'comment') => ability.can(action, subject('Claim', { ...c }));
  const editable = (c.state === 'draft' || c.state === 'returned') && may('update');
  return (
    <article className="space-y-5" aria-labelledby="claim-title">
      <title>{`${c.number} · Fieldproof`}</title>
      <BackToClaims />
      <div id="claim-title">
        <ClaimHeading claim={c} />
      </div>
      <ClaimStatusNote claim={c} />
      <div className="flex flex-wrap items-start gap-2">
        {editable && (
          <ButtonLink to={paths.claimEdit(c.id)} variant={c.allowedActions.includes('submit') ? 'secondary' : 'primary'}>
            {c.state === 'returned' ? 'Fix and resubmit' : 'Continue editing'}
          </ButtonLink>
        )}
        <ClaimActionsBar claim={c} approveSummary={valuation.data ? `Approving ${formatCents(valuation.data.totals.approved.totalCents, c.currency)} in all.` : undefined} />
      </div>
      <div className="grid grid-cols-1 gap-5 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
        <div className="min-w-0 space-y-5">
          {c.state === 'in_review' && c.canTakeOver && <TakeOverPanel claim={c} />}
          {c.state === 'in_review' && may('adjust') && !c.canTakeOver && <AdjustmentsPanel claim={c} valuation={valuation.data} />}
          <SubmissionChangesPanel claim={c} />
          <ClaimStory claim={c} />
          <ClaimLines claim={c} valuation={valuation.data} />
          <PartReturnsPanel claimId={c.id} enabled={(c.state === 'approved' || c.state === 'paid') && c.partLines.some((p) => p.returnStatus !== 'not_required')} />
          <ValuationSection claimId={c.id} />
          <ReadingsPanel claimId={c.id} />
          <EvidencePanel claimId={c.id} editable={false} retractable={(c.state === 'submitted' || c.state === 'in_review') && ability.can('upload', subject('Claim', { ...c, state: 'draft' }))} />
        </div>
        <div className="min-w-0 space-y-5">
          <ClaimUnitCard claim={c} />
          <UnitClaimsPanel claim={c} />
          <ClaimSiteCard claim={c} />
          <ClaimDatesCard claim={c} />
          <ClaimActivity claim={c} canComment={may('comment')} />
        </div>
      </div>
    </article>
  );
}

function ClaimError({ error }: { error: unknown }) {
  const notFound = isApiError(error, 404) || (isRouteErrorResponse(error) && error.status === 404);
  return (
    <div className="space-y-4">
      <title>{`${notFound ? 'Claim not found' : 'Claim unavailable'} · Fieldproof`}</title>
      <BackToClaims />
      <h1 className="text-2xl font-semibold text-ink-900">{notFound ? 'Claim not found' : 'The claim could not be loaded'}</h1>
      {notFound ? (
        <Alert tone="info">There is no claim at this address, or it is not visible to your organisation. Check the claim number and search the list.</Alert>
      ) : (
        <Alert tone="error">{errorMessage(error)}</Alert>
      )}
    </div>
  );
}

/** Shown inside the shell when the loader fails, e.g. a claim id that is unknown or not this user's. */
export function ClaimErrorBoundary() {
  const error = useRouteError();
  if (isApiError(error, 401)) throw error;
  return <ClaimError error={error} />;
}
