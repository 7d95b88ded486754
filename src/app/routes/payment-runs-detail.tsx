import { Link, useParams, type LoaderFunctionArgs } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import { Alert } from '@/components/ui/alert';
import { Spinner } from '@/components/ui/spinner';
import { errorMessage, isApiError } from '@/lib/api-client';
import { requireSession } from '../require-session';
import { paymentRunQuery, usePaymentRun } from '@/features/payments/api/get-payment-run';
import { PaymentRunView } from '@/features/payments/components/payment-run-detail';
import { paymentPaths } from '@/features/payments/paths';

export const paymentRunLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    await requireSession(queryClient, request);
    await queryClient.prefetchQuery(paymentRunQuery(params.id ?? ''));
    return null;
  };

/** One payment run with its claims; the accountant marks it paid or voids it here. */
export function PaymentRunRoute() {
  const { id = '' } = useParams();
  const run = usePaymentRun(id);
  return (
    <div className="space-y-5">
      <title>{`${run.data?.number ?? 'Payment run'} · Fieldproof`}</title>
      <Link to={paymentPaths.runs} className="inline-flex items-center gap-1 text-sm text-ink-700 underline-offset-2 hover:underline">
        <span aria-hidden="true">←</span> Payment runs
      </Link>
      {run.isPending && <Spinner label="Loading the payment run…" />}
      {run.isError &&
        (isApiError(run.error, 404) ? (
          <>
            <h1 className="text-2xl font-semibold text-ink-900">Payment run not found</h1>
            <Alert tone="info">There is no payment run at this address, or it is not visible to your organisation.</Alert>
          </>
        ) : (
          <Alert tone="error">{errorMessage(run.error)}</Alert>
        ))}
      {run.data && <PaymentRunView run={run.data} />}
    </div>
  );
}
