import { useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { createTermsSchema, type ContractTermsItem } from '@shared/schemas/admin';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input } from '@/components/ui/input';
import { applyServerErrors } from '@/lib/form-errors';
import { useCreateTerms } from '../api/create-terms';
import { useUpdateTerms } from '../api/update-terms';
import { MoneyInput } from './money-input';

type Values = z.input<typeof createTermsSchema>;
const fieldNames = [
  'effectiveFrom',
  'effectiveTo',
  'laborRateCents',
  'travelRateCents',
  'mileageRateCents',
  'maxRoundTripMiles',
  'maxTravelHours',
  'partsDiscountBps',
  'partsHandlingBps',
  'overtimeMultiplier',
  'filingWindowDays',
] as const;

const blankNull = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));
const bpsText = (bps: number | undefined) => (bps === undefined || Number.isNaN(bps) ? '' : String(bps / 100));
const parsePercent = (t: string) => (t.trim() === '' || !/^\d+(\.\d{1,2})?$/.test(t.trim()) ? Number.NaN : Math.round(Number(t.trim()) * 100));

/**
 * One period of contract terms. Dates are inclusive; no end date means open-ended. Periods of
 * one agency never overlap (the server refuses and says which period is in the way).
 */
export function TermsForm({ agencyId, terms, copyOf, onDone }: { agencyId: string; terms?: ContractTermsItem; copyOf?: ContractTermsItem; onDone: () => void }) {
  const create = useCreateTerms();
  const update = useUpdateTerms();
  const [formError, setFormError] = useState<string | null>(null);
  const { register, control, handleSubmit, setError, formState } = useForm<Values, unknown, z.output<typeof createTermsSchema>>({
    resolver: zodResolver(createTermsSchema),
    defaultValues: terms
      ? {
          effectiveFrom: terms.effectiveFrom,
          effectiveTo: terms.effectiveTo,
          laborRateCents: terms.laborRateCents,
          travelRateCents: terms.travelRateCents,
          mileageRateCents: terms.mileageRateCents,
          maxRoundTripMiles: terms.maxRoundTripMiles,
          maxTravelHours: terms.maxTravelHours,
          partsDiscountBps: terms.partsDiscountBps,
          partsHandlingBps: terms.partsHandlingBps,
          overtimeMultiplier: terms.overtimeMultiplier,
          filingWindowDays: terms.filingWindowDays,
          closePrevious: false,
        }
      : copyOf
        ? {
            // new terms start as a copy of those in force (rates, caps, discount, handling, window)
            effectiveTo: null,
            laborRateCents: copyOf.laborRateCents,
            travelRateCents: copyOf.travelRateCents,
            mileageRateCents: copyOf.mileageRateCents,
            maxRoundTripMiles: copyOf.maxRoundTripMiles,
            maxTravelHours: copyOf.maxTravelHours,
            partsDiscountBps: copyOf.partsDiscountBps,
            partsHandlingBps: copyOf.partsHandlingBps,
            overtimeMultiplier: copyOf.overtimeMultiplier,
            filingWindowDays: copyOf.filingWindowDays,
            closePrevious: true,
          }
        : { effectiveTo: null, mileageRateCents: null, partsDiscountBps: 0, partsHandlingBps: 0, overtimeMultiplier: 1.5, filingWindowDays: 30, closePrevious: true },
  });
  const errors = formState.errors;
  const num = { valueAsNumber: true } as const;
  const onSubmit = handleSubmit((v) => {
    const fail = (e: unknown) => setFormError(applyServerErrors(e, setError, fieldNames));
    if (terms) {
      const { closePrevious: _c, ...body } = v;
      update.mutate({ agencyId, termsId: terms.id, body }, { onSuccess: onDone, onError: fail });
    } else create.mutate({ agencyId, body: v }, { onSuccess: onDone, onError: fail });
  });
  const percent = (name: 'partsDiscountBps' | 'partsHandlingBps', label: string) => (
    <Field label={label} error={errors[name]?.message}>
      {(p) => (
        <Controller
          control={control}
          name={name}
          render={({ field }) => <PercentInput control={p} value={field.value} onChange={field.onChange} />}
        />
      )}
    </Field>
  );
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label={terms ? 'Edit contract terms' : 'New contract terms'}>
      {formError && <Alert tone="error">{formError}</Alert>}
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="In force from" error={errors.effectiveFrom?.message}>
          {(p) => <Input {...p} type="date" {...register('effectiveFrom')} />}
        </Field>
        <Field label="Until (last day)" hint="Leave empty for no end date" error={errors.effectiveTo?.message}>
          {(p) => <Input {...p} type="date" {...register('effectiveTo', { setValueAs: (v) => (v === '' ? null : v) })} />}
        </Field>
      </div>
      <div className="grid gap-4 sm:grid-cols-3">
        <Field label="Labor rate per hour" error={errors.laborRateCents?.message}>
          {(p) => <Controller control={control} name="laborRateCents" render={({ field }) => <MoneyInput control={p} value={field.value} onChange={field.onChange} />} />}
        </Field>
        <Field label="Travel rate per hour" error={errors.travelRateCents?.message}>
          {(p) => <Controller control={control} name="travelRateCents" render={({ field }) => <MoneyInput control={p} value={field.value} onChange={field.onChange} />} />}
        </Field>
        <Field label="Mileage (cents per mile)" hint="Empty: the dated mileage rate in force on the repair date" error={errors.mileageRateCents?.message}>
          {(p) => <Input {...p} inputMode="decimal" {...register('mileageRateCents', { setValueAs: blankNull })} />}
        </Field>
      </div>
      <div className="grid gap-4 sm:grid-cols-3">
        <Field label="Round-trip miles cap" error={errors.maxRoundTripMiles?.message}>
          {(p) => <Input {...p} inputMode="decimal" {...register('maxRoundTripMiles', num)} />}
        </Field>
        <Field label="Travel hours cap" error={errors.maxTravelHours?.message}>
          {(p) => <Input {...p} inputMode="decimal" {...register('maxTravelHours', num)} />}
        </Field>
        <Field label="Overtime multiplier" error={errors.overtimeMultiplier?.message}>
          {(p) => <Input {...p} inputMode="decimal" {...register('overtimeMultiplier', num)} />}
        </Field>
      </div>
      <div className="grid gap-4 sm:grid-cols-3">
        {percent('partsDiscountBps', 'Parts discount (%)')}
        {percent('partsHandlingBps', 'Parts handling (%)')}
        <Field label="Filing window (days)" error={errors.filingWindowDays?.message}>
          {(p) => <Input {...p} inputMode="numeric" {...register('filingWindowDays', num)} />}
        </Field>
      </div>
      {!terms && (
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" className="size-4" {...register('closePrevious')} /> End the open-ended terms before these on the day before they start
        </label>
      )}
      <Button type="submit" pending={create.isPending || update.isPending}>
        {terms ? 'Save the terms' : 'Add the terms'}
      </Button>
    </form>
  );
}

function PercentInput({ control, value, onChange }: { control: object; value: number | undefined; onChange: (bps: number) => void }) {
  const [text, setText] = useState(bpsText(value));
  return (
    <Input
      {...control}
      inputMode="decimal"
      value={text}
      onChange={(e) => {
        setText(e.target.value);
        onChange(parsePercent(e.target.value));
      }}
    />
  );
}
