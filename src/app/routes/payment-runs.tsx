import type { LoaderFunctionArgs } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { Alert } from '@/components/ui/alert';
import { ButtonLink } from '@/components/ui/button';
import { Card, CardHeader } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/empty-state';
import { Spinner } from '@/components/ui/spinner';
import { useAppAbility } from '@/lib/ability';
import { errorMessage } from '@/lib/api-client';
import { requireSession } from '../require-session';
import { paymentRunsQuery, usePaymentRuns } from '@/features/payments/api/get-payment-runs';
import { PaymentRunsTable } from '@/features/payments/components/payment-runs-table';
import { ExportDownload } from '@/features/payments/components/export-download';
import { paymentPaths } from '@/features/payments/paths';

export const paymentRunsLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requireSession(queryClient, request);
    // Errors (e.g. a role without payment runs) are shown by the screen.
    await queryClient.prefetchQuery(paymentRunsQuery());
    return null;
  };

/** Payment runs: the accountant's batches of every agency, or an agency admin's own, with the CSV export. */
export function PaymentRunsRoute() {
  const ability = useAppAbility();
  const runs = usePaymentRuns();
  const isAccountant = ability.can('create', 'PaymentRun');
  const agencies = isAccountant ? [...new Map((runs.data?.items ?? []).map((r) => [r.agencyId, r.agencyName])).entries()].map(([id, name]) => ({ id, name })).sort((a, b) => a.name.localeCompare(b.name)) : null;
  return (
    <div className="space-y-5">
      <title>Payment runs · Fieldproof</title>
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-ink-900">Payment runs</h1>
          <p className="text-sm text-ink-600">{isAccountant ? 'Batches of approved claims, one agency each, paid by one transfer or check.' : 'What the manufacturer has paid your agency, run by run.'}</p>
        </div>
        {isAccountant && <ButtonLink to={paymentPaths.ready}>Ready to pay</ButtonLink>}
      </div>
      <Card aria-labelledby="runs-list">
        <CardHeader id="runs-list" title="Runs" />
        {runs.isPending && <Spinner label="Loading payment runs…" />}
        {runs.isError && (
          <div className="p-4">
            <Alert tone="error">{errorMessage(runs.error)}</Alert>
          </div>
        )}
        {runs.data && runs.data.items.length === 0 && <EmptyState title="No payment runs yet">{isAccountant ? 'Create one from the claims ready to pay.' : 'Runs appear here once the manufacturer pays your claims.'}</EmptyState>}
        {runs.data && runs.data.items.length > 0 && <PaymentRunsTable runs={runs.data.items} showAgency={isAccountant} />}
      </Card>
      {ability.can('export', 'PaidClaimsExport') && <ExportDownload agencies={agencies} />}
    </div>
  );
}
