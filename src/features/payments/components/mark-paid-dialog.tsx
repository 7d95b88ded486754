import { useEffect, useRef, useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { markPaidSchema, paymentDateBounds, type MarkPaidInput, type PaymentRunDetail } from '@shared/schemas/payment';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import { errorMessage, isApiError } from '@/lib/api-client';
import { useBusinessToday, useOrganisationTimeZone } from '@/lib/business-day';
import { formatCents, plural } from '@/lib/format';
import { useMarkPaymentRunPaid } from '../api/update-payment-run';

/**
 * The payment date and the bank or check reference, in a modal dialog. Confirming pays every
 * claim of the run at once and sends the remittance to the agency's admins.
 */
export function MarkPaidDialog({ run }: { run: PaymentRunDetail }) {
  const ref = useRef<HTMLDialogElement>(null);
  const [open, setOpen] = useState(false);
  const paid = useMarkPaymentRunPaid(run.id);
  const today = useBusinessToday();
  // the bounds the server holds the date to: from the run's creation day to tomorrow
  const bounds = paymentDateBounds(run.createdAt, new Date(), useOrganisationTimeZone());
  const form = useForm<MarkPaidInput>({ resolver: zodResolver(markPaidSchema), defaultValues: { paymentDate: today, reference: '' } });
  const { errors } = form.formState;

  useEffect(() => {
    const d = ref.current;
    if (!d) return;
    if (open && !d.open) d.showModal?.();
    if (!open && d.open) d.close?.();
  }, [open]);

  const submit = form.handleSubmit((body) =>
    paid.mutate(body, {
      onSuccess: () => setOpen(false),
      onError: (e) => {
        if (isApiError(e, 400) && e.fields) for (const [k, v] of Object.entries(e.fields)) if (k === 'paymentDate' || k === 'reference') form.setError(k, { message: v });
      },
    }),
  );

  return (
    <>
      <Button onClick={() => setOpen(true)}>Mark paid</Button>
      <dialog
        ref={ref}
        aria-labelledby={`mark-paid-${run.id}`}
        onClose={() => setOpen(false)}
        className="m-auto w-full max-w-md rounded-lg border border-ink-200 p-0 shadow-xl backdrop:bg-ink-900/40"
      >
        <form onSubmit={submit} className="space-y-4 p-5" noValidate>
          <h2 id={`mark-paid-${run.id}`} className="text-lg font-semibold text-ink-900">
            Mark {run.number} paid
          </h2>
          <p className="text-sm text-ink-700">
            {plural(run.claims.length, 'claim')} of {run.agencyName}, {formatCents(run.totalCents, run.currency)}. Every claim moves to paid and the agency’s admins receive the remittance
            with the lines attached.
          </p>
          <Field label="Payment date" hint={`Between ${bounds.from} and ${bounds.to}.`} error={errors.paymentDate?.message}>
            {(p) => <Input type="date" min={bounds.from} max={bounds.to} {...p} {...form.register('paymentDate')} />}
          </Field>
          <Field label="Bank or check reference" hint="As it appears on the transfer or the check." error={errors.reference?.message}>
            {(p) => <Input autoComplete="off" maxLength={80} {...p} {...form.register('reference')} />}
          </Field>
          {paid.isError && !isApiError(paid.error, 400) && (
            <Alert tone="error" title="The run was not marked paid">
              {errorMessage(paid.error)}
            </Alert>
          )}
          <div className="flex justify-end gap-2">
            <Button variant="secondary" onClick={() => setOpen(false)}>
              Cancel
            </Button>
            <Button type="submit" pending={paid.isPending}>
              Confirm payment
            </Button>
          </div>
        </form>
      </dialog>
    </>
  );
}
