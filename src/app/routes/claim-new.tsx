import { Link, useNavigate, type LoaderFunctionArgs } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { Alert } from '@/components/ui/alert';
import { paths } from '@/config/paths';
import { useAppAbility } from '@/lib/ability';
import { NewClaimFlow } from '@/features/claim-form/components/new-claim-flow';
import { requireSession } from '../require-session';

export const claimNewLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requireSession(queryClient, request);
    return null;
  };

/** /claims/new: find the unit by serial, see its coverage, open the draft. */
export function ClaimNewRoute() {
  const navigate = useNavigate();
  const ability = useAppAbility();
  return (
    <div className="mx-auto max-w-3xl space-y-5">
      <title>New claim · Fieldproof</title>
      <Link to={paths.claims} className="inline-flex items-center gap-1 text-sm text-ink-700 underline-offset-2 hover:underline">
        <span aria-hidden="true">←</span> Claims
      </Link>
      <div>
        <h1 className="text-2xl font-semibold text-ink-900">New claim</h1>
        <p className="text-sm text-ink-700">Start with the unit. The draft is saved as you work, so you can finish it later from the claim list.</p>
      </div>
      {ability.can('create', 'Claim') ? (
        <NewClaimFlow onCreated={(claim) => navigate(paths.claimEdit(claim.id), { replace: true })} />
      ) : (
        <Alert tone="info">Claims are filed by the technicians and admins of a service agency.</Alert>
      )}
    </div>
  );
}
