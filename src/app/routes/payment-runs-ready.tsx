import { Link, useNavigate, type LoaderFunctionArgs } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { Alert } from '@/components/ui/alert';
import { EmptyState } from '@/components/ui/empty-state';
import { Spinner } from '@/components/ui/spinner';
import { errorMessage } from '@/lib/api-client';
import { plural } from '@/lib/format';
import { requireSession } from '../require-session';
import { readyToPayQuery, useReadyToPay } from '@/features/payments/api/get-ready-to-pay';
import { ReadyAgencyCard } from '@/features/payments/components/ready-to-pay';
import { paymentPaths } from '@/features/payments/paths';

export const readyToPayLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requireSession(queryClient, request);
    await queryClient.prefetchQuery(readyToPayQuery());
    return null;
  };

/** Approved claims whose part returns are settled, grouped by agency, to put into payment runs. */
export function ReadyToPayRoute() {
  const ready = useReadyToPay();
  const navigate = useNavigate();
  return (
    <div className="space-y-5">
      <title>Ready to pay · Fieldproof</title>
      <Link to={paymentPaths.runs} className="inline-flex items-center gap-1 text-sm text-ink-700 underline-offset-2 hover:underline">
        <span aria-hidden="true">←</span> Payment runs
      </Link>
      <div>
        <h1 className="text-2xl font-semibold text-ink-900">Ready to pay</h1>
        <p className="text-sm text-ink-600">
          Approved claims with every required part return received or waived, not yet in a run.
          {ready.data ? ` ${plural(ready.data.claimCount, 'claim')} in all.` : ''}
        </p>
      </div>
      {ready.isPending && <Spinner label="Loading claims ready to pay…" />}
      {ready.isError && <Alert tone="error">{errorMessage(ready.error)}</Alert>}
      {ready.data && ready.data.agencies.length === 0 && <EmptyState title="Nothing to pay">Approved claims appear here once their part returns are settled.</EmptyState>}
      {ready.data?.agencies.map((g) => (
        <ReadyAgencyCard key={`${g.agencyId}:${g.currency}:${g.claims.map((c) => c.id).join()}`} group={g} onCreated={(run) => navigate(paymentPaths.run(run.id))} />
      ))}
    </div>
  );
}
