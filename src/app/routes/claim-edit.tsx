import { Link, useNavigate, useParams, type LoaderFunctionArgs } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { subject } from '@casl/ability';
import { Alert } from '@/components/ui/alert';
import { ButtonLink } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { useAppAbility } from '@/lib/ability';
import { claimQueries } from '@/features/claims/api/claim-queries';
import { useClaim } from '@/features/claims/api/get-claim';
import { useTransitionClaim } from '@/features/claims/api/transition-claim';
import { ClaimActionsBar } from '@/features/claims/components/claim-actions-bar';
import { ClaimStateBadge } from '@/features/claims/components/claim-state-badge';
import { ValuationBreakdown } from '@/features/claims/components/valuation-breakdown';
import { valuationBasisQuery } from '@/features/claim-form/api/get-valuation-basis';
import { ClaimEditor } from '@/features/claim-form/components/claim-editor';
import { ClaimActivity } from '@/features/comments/components/claim-activity';
import { EvidencePanel } from '@/features/evidence/components/evidence-panel';
import { loadOrSignIn, requireSession } from '../require-session';
import { ClaimErrorBoundary } from './claim';

export const claimEditLoader =
  (queryClient: QueryClient) =>
  async ({ params, request }: LoaderFunctionArgs) => {
    await requireSession(queryClient, request);
    const id = params.id ?? '';
    void queryClient.prefetchQuery(valuationBasisQuery(id));
    await loadOrSignIn(queryClient, request, () => queryClient.ensureQueryData(claimQueries.detail(id)), { rethrow: true });
    return null;
  };

export { ClaimErrorBoundary as ClaimEditErrorBoundary };

/** /claims/:id/edit: the editor of a draft or a returned claim. */
export function ClaimEditRoute() {
  const { id = '' } = useParams();
  const navigate = useNavigate();
  const ability = useAppAbility();
  const claim = useClaim(id);
  const move = useTransitionClaim(id);
  if (!claim.data) return <Spinner label="Loading the claim…" />;
  const c = claim.data;
  const editable = (c.state === 'draft' || c.state === 'returned') && ability.can('update', subject('Claim', { ...c }));

  if (!editable) {
    return (
      <div className="space-y-4">
        <title>{`${c.number} · Fieldproof`}</title>
        <h1 className="font-mono text-2xl font-semibold text-ink-900">{c.number}</h1>
        <Alert tone="info" title="This claim cannot be edited">
          {c.state === 'draft' || c.state === 'returned' ? 'You may read this claim but not change it.' : `It is ${c.state.replace('_', ' ')} now; only drafts and returned claims are edited.`}
        </Alert>
        <ButtonLink to={paths.claim(c.id)} variant="secondary">
          Open the claim
        </ButtonLink>
      </div>
    );
  }

  return (
    <div className="space-y-5">
      <title>{`${c.state === 'returned' ? 'Fix' : 'Edit'} ${c.number} · Fieldproof`}</title>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <Link to={paths.claims} className="inline-flex items-center gap-1 text-sm text-ink-700 underline-offset-2 hover:underline">
          <span aria-hidden="true">←</span> Claims
        </Link>
        <ClaimActionsBar claim={c} only={['withdraw']} onMoved={(next) => navigate(paths.claim(next.id), { replace: true })} />
      </div>
      <ClaimEditor
        key={c.id}
        claim={c}
        headerExtra={<ClaimStateBadge state={c.state} />}
        renderValuation={(v) => <ValuationBreakdown valuation={v} />}
        renderUploader={({ gas, onImported }) => <EvidencePanel claimId={c.id} editable bare gas={gas} onImported={onImported} />}
        submitClaim={(version) => move.mutateAsync({ type: 'submit', version })}
        onSubmitted={(next) => navigate(paths.claim(next.id), { replace: true, state: { submitted: true } })}
        footer={<ClaimActivity claim={c} canComment={ability.can('comment', subject('Claim', { ...c }))} />}
      />
    </div>
  );
}
