import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { createMileageRateSchema, endMileageRateSchema, type CreateMileageRateBody, type CreateMileageRateInput, type EndMileageRateBody, type MileageRateGap, type MileageRateItem } from '@shared/schemas/mileage-rates';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Field } from '@/components/ui/field';
import { Input, Select } from '@/components/ui/input';
import { Modal } from '@/components/ui/modal';
import { Skeleton } from '@/components/ui/skeleton';
import { Table, TBody, Td, Th, THead, Tr } from '@/components/ui/table';
import { errorMessage } from '@/lib/api-client';
import { applyServerErrors } from '@/lib/form-errors';
import { formatDate } from '@/lib/format';
import { useMileageRates } from '../api/get-mileage-rates';
import { useCreateMileageRate } from '../api/create-mileage-rate';
import { useEndMileageRate } from '../api/end-mileage-rate';

const HISTORY_START = '0001-01-01';
/** 725 tenths of a cent → "72.5 cents". */
export const rateText = (tenths: number) => `${Math.floor(tenths / 10)}${tenths % 10 ? `.${tenths % 10}` : ''} cents`;
const unitText = (u: 'mi' | 'km') => (u === 'mi' ? 'per mile' : 'per kilometre');
const gapText = (g: MileageRateGap) =>
  g.from === HISTORY_START ? (g.to ? `before ${formatDate(g.to)} (inclusive)` : 'on any date') : g.to ? `${formatDate(g.from)} to ${formatDate(g.to)}` : `from ${formatDate(g.from)} on`;
const emptyIsNull = { setValueAs: (v: unknown) => (v === '' ? null : v) };

/** Dated mileage rates per currency; warns about days and claims that no rate covers. */
export function MileageRatesPanel() {
  const rates = useMileageRates();
  const [editing, setEditing] = useState<MileageRateItem | 'new' | null>(null);
  const data = rates.data;
  return (
    <Card>
      <CardHeader
        title="Mileage rates"
        description="The rate per mile or kilometre used when an agency’s contract terms carry none. A repair date without a rate cannot be valued."
        actions={<Button onClick={() => setEditing('new')}>New rate</Button>}
      />
      {rates.isPending && <Skeleton className="m-4 h-40" />}
      {rates.isError && (
        <CardBody>
          <Alert tone="error">{errorMessage(rates.error)}</Alert>
        </CardBody>
      )}
      {data && (data.noRateToday.length > 0 || data.gaps.length > 0) && (
        <CardBody>
          <Alert tone="warning" title="Days without a mileage rate">
            <ul className="list-disc space-y-1 pl-5">
              {data.noRateToday.map((c) => (
                <li key={`today-${c}`}>No {c} rate is in force today ({formatDate(data.today)}).</li>
              ))}
              {data.gaps.map((g) => (
                <li key={`${g.currency}-${g.from}`}>
                  {g.currency}: no rate {gapText(g)}
                  {g.openClaims > 0 ? ` — ${g.openClaims} open claim${g.openClaims === 1 ? '' : 's'} repaired then cannot be valued.` : '.'}
                </li>
              ))}
            </ul>
          </Alert>
        </CardBody>
      )}
      {data && (
        <Table caption="Mileage rates">
          <THead>
            <Tr>
              <Th>Currency</Th>
              <Th>In force</Th>
              <Th className="text-right">Rate</Th>
              <Th>Source</Th>
              <Th>Actions</Th>
            </Tr>
          </THead>
          <TBody>
            {data.items.map((r) => (
              <Tr key={r.id}>
                <Td className="font-mono">{r.currency}</Td>
                <Td>
                  {formatDate(r.effectiveFrom)} to {r.effectiveTo ? formatDate(r.effectiveTo) : <Badge tone="slate">until further notice</Badge>}
                </Td>
                <Td className="text-right tabular-nums">
                  {rateText(r.rateTenthCents)} {unitText(r.unit)}
                </Td>
                <Td>{r.source}</Td>
                <Td className="text-right">
                  <Button size="sm" variant="secondary" onClick={() => setEditing(r)} aria-label={`End the ${r.currency} rate from ${r.effectiveFrom}`}>
                    End
                  </Button>
                </Td>
              </Tr>
            ))}
          </TBody>
        </Table>
      )}
      <Modal open={editing !== null} onClose={() => setEditing(null)} title={editing === 'new' ? 'New mileage rate' : `End the ${editing?.currency ?? ''} rate from ${editing?.effectiveFrom ?? ''}`}>
        {editing === 'new' && <CreateRateForm onDone={() => setEditing(null)} />}
        {editing && editing !== 'new' && <EndRateForm rate={editing} onDone={() => setEditing(null)} />}
      </Modal>
    </Card>
  );
}

function CreateRateForm({ onDone }: { onDone: () => void }) {
  const create = useCreateMileageRate();
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState, getValues } = useForm<CreateMileageRateInput, unknown, CreateMileageRateBody>({
    resolver: zodResolver(createMileageRateSchema),
    defaultValues: { currency: 'USD', unit: 'mi', effectiveFrom: '', effectiveTo: null, rateCents: '', source: '', reason: '' },
  });
  const errors = formState.errors;
  // the rate is sent as typed ("72.5"): the server reads it into tenths of a cent with the same schema
  const onSubmit = handleSubmit(() => {
    const { reason, ...raw } = getValues();
    create.mutate(
      { ...raw, currency: raw.currency.trim().toUpperCase(), ...(reason && reason.trim() ? { reason } : {}) },
      { onSuccess: onDone, onError: (err) => setFormError(applyServerErrors(err, setError, ['currency', 'unit', 'effectiveFrom', 'effectiveTo', 'rateCents', 'source', 'reason'])) },
    );
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError && <Alert tone="error">{formError}</Alert>}
      <Field label="Currency" hint="ISO 4217 code, like USD or CAD" error={errors.currency?.message}>
        {(p) => <Input {...p} {...register('currency')} autoCapitalize="characters" className="w-28" />}
      </Field>
      <Field label="Distance unit" error={errors.unit?.message}>
        {(p) => (
          <Select {...p} {...register('unit')}>
            <option value="mi">Per mile</option>
            <option value="km">Per kilometre</option>
          </Select>
        )}
      </Field>
      <Field label="First day in force" error={errors.effectiveFrom?.message}>
        {(p) => <Input {...p} type="date" {...register('effectiveFrom')} />}
      </Field>
      <Field label="Last day in force" hint="Leave empty for until further notice" error={errors.effectiveTo?.message}>
        {(p) => <Input {...p} type="date" {...register('effectiveTo', emptyIsNull)} />}
      </Field>
      <Field label="Rate in cents" hint="Like 72.5 (one decimal place at most)" error={errors.rateCents?.message}>
        {(p) => <Input {...p} inputMode="decimal" {...register('rateCents')} className="w-32" />}
      </Field>
      <Field label="Source" hint="The published notice, like its number" error={errors.source?.message}>
        {(p) => <Input {...p} {...register('source')} />}
      </Field>
      <Field label="Reason" hint="Needed when the first day is in the past" error={errors.reason?.message}>
        {(p) => <Input {...p} {...register('reason')} />}
      </Field>
      <Button type="submit" pending={create.isPending}>
        Add the rate
      </Button>
    </form>
  );
}

function EndRateForm({ rate, onDone }: { rate: MileageRateItem; onDone: () => void }) {
  const end = useEndMileageRate();
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<EndMileageRateBody>({
    resolver: zodResolver(endMileageRateSchema),
    defaultValues: { effectiveTo: rate.effectiveTo ?? '', reason: '' },
  });
  const errors = formState.errors;
  const onSubmit = handleSubmit((v) =>
    end.mutate({ id: rate.id, body: { effectiveTo: v.effectiveTo, ...(v.reason ? { reason: v.reason } : {}) } }, { onSuccess: onDone, onError: (err) => setFormError(applyServerErrors(err, setError, ['effectiveTo', 'reason'])) }),
  );
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError && <Alert tone="error">{formError}</Alert>}
      <p className="text-sm text-ink-700">
        {rateText(rate.rateTenthCents)} {unitText(rate.unit)}, in force from {formatDate(rate.effectiveFrom)}.
      </p>
      <Field label="Last day in force" error={errors.effectiveTo?.message}>
        {(p) => <Input {...p} type="date" {...register('effectiveTo')} />}
      </Field>
      <Field label="Reason" hint="Needed when the last day is in the past" error={errors.reason?.message}>
        {(p) => <Input {...p} {...register('reason')} />}
      </Field>
      <Button type="submit" pending={end.isPending}>
        End the rate
      </Button>
    </form>
  );
}
