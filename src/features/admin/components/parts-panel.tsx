import type { AffectedClaims } from '@shared/schemas/admin';
import { useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { createPartSchema, updatePartSchema, type PartItem } from '@shared/schemas/admin';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input, Select } from '@/components/ui/input';
import { applyServerErrors } from '@/lib/form-errors';
import { ActiveCheckbox, AffectedClaimsNotice, CataloguePanel, DatedHistory, DatedValue, StatusBadge, today } from './catalogue-panel';
import { formatCents } from '@/lib/format';
import { useParts } from '../api/get-parts';
import { useCreatePart } from '../api/create-part';
import { useUpdatePart } from '../api/update-part';
import { usePriceHistory } from '../api/get-price-history';
import { MoneyInput } from './money-input';
import { FamilyOptions } from './family-options';

/** Parts with their list price (effective-dated) and whether the failed part must come back. */
export function PartsPanel() {
  return (
    <CataloguePanel<PartItem>
      title="Parts"
      description="A new list price applies to claims repaired on or after its effective date."
      caption="Parts"
      newLabel="New part"
      newTitle="New part"
      editLabel={(p) => `Edit part ${p?.partNumber ?? ''}`}
      query={useParts()}
      columns={[
        { header: 'Part number', cellClassName: 'font-mono', cell: (p) => p.partNumber },
        { header: 'Description', cell: (p) => p.description },
        { header: 'Family', cell: (p) => p.familyCode ?? 'Any' },
        {
          header: 'List price today',
          className: 'text-right',
          cellClassName: 'text-right tabular-nums',
          cell: (p) => <DatedValue now={formatCents(p.listPriceCents, 'USD')} scheduled={p.scheduled} show={(s) => formatCents(s.listPriceCents, 'USD')} />,
        },
        { header: 'Return', cell: (p) => (p.returnRequired ? <Badge tone="orange">Required</Badge> : '—') },
        { header: 'Status', cell: (p) => <StatusBadge active={p.active} /> },
      ]}
      renderCreate={(done) => <CreatePartForm onDone={done} />}
      renderEdit={(p, done) => <EditPartForm part={p} onDone={done} />}
    />
  );
}

const familyValue = { setValueAs: (v: unknown) => (v === '' ? null : v) };

function CreatePartForm({ onDone }: { onDone: () => void }) {
  const create = useCreatePart();
  const [formError, setFormError] = useState<string | null>(null);
  const { register, control, handleSubmit, setError, formState } = useForm<z.input<typeof createPartSchema>, unknown, z.output<typeof createPartSchema>>({
    resolver: zodResolver(createPartSchema),
    defaultValues: { partNumber: '', description: '', familyId: null, returnRequired: false },
  });
  const errors = formState.errors;
  const onSubmit = handleSubmit((v) =>
    create.mutate(v, { onSuccess: onDone, onError: (e) => setFormError(applyServerErrors(e, setError, ['partNumber', 'description', 'familyId', 'listPriceCents'])) }),
  );
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError && <Alert tone="error">{formError}</Alert>}
      <Field label="Part number" hint="Fixed once created" error={errors.partNumber?.message}>
        {(p) => <Input {...p} {...register('partNumber')} />}
      </Field>
      <Field label="Description" error={errors.description?.message}>
        {(p) => <Input {...p} {...register('description')} />}
      </Field>
      <Field label="Product family" error={errors.familyId?.message}>
        {(p) => (
          <Select {...p} {...register('familyId', familyValue)}>
            <FamilyOptions blank="Any family" />
          </Select>
        )}
      </Field>
      <Field label="List price" error={errors.listPriceCents?.message}>
        {(p) => <Controller control={control} name="listPriceCents" render={({ field }) => <MoneyInput control={p} value={field.value} onChange={field.onChange} onBlur={field.onBlur} />} />}
      </Field>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" className="size-4" {...register('returnRequired')} /> The failed part must be returned before the claim is paid
      </label>
      <Button type="submit" pending={create.isPending}>
        Create the part
      </Button>
    </form>
  );
}

function EditPartForm({ part, onDone }: { part: PartItem; onDone: () => void }) {
  const update = useUpdatePart();
  const history = usePriceHistory(part.id);
  const [affected, setAffected] = useState<AffectedClaims | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const { register, control, handleSubmit, setError, formState } = useForm<z.input<typeof updatePartSchema>, unknown, z.output<typeof updatePartSchema>>({
    resolver: zodResolver(updatePartSchema),
    defaultValues: {
      description: part.description,
      familyId: part.familyId,
      returnRequired: part.returnRequired,
      active: part.active,
      listPriceCents: part.listPriceCents,
      priceEffectiveFrom: today(),
    },
  });
  const errors = formState.errors;
  const onSubmit = handleSubmit((v) => {
    const body = v.listPriceCents === part.listPriceCents && !formState.dirtyFields.priceEffectiveFrom ? { ...v, listPriceCents: undefined, priceEffectiveFrom: undefined } : v;
    update.mutate(
      { id: part.id, body },
      { onSuccess: (item) => (item.affectedClaims ? setAffected(item.affectedClaims) : onDone()), onError: (e) => setFormError(applyServerErrors(e, setError, ['description', 'familyId', 'listPriceCents', 'priceEffectiveFrom', 'reason'])) },
    );
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {affected && <AffectedClaimsNotice what="price" affected={affected} onClose={onDone} />}
      {formError && <Alert tone="error">{formError}</Alert>}
      <Field label="Description" error={errors.description?.message}>
        {(p) => <Input {...p} {...register('description')} />}
      </Field>
      <Field label="Product family" error={errors.familyId?.message}>
        {(p) => (
          <Select {...p} {...register('familyId', familyValue)}>
            <FamilyOptions blank="Any family" />
          </Select>
        )}
      </Field>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="List price" error={errors.listPriceCents?.message}>
          {(p) => <Controller control={control} name="listPriceCents" render={({ field }) => <MoneyInput control={p} value={field.value} onChange={(c) => field.onChange(c ?? undefined)} onBlur={field.onBlur} />} />}
        </Field>
        <Field label="Applies to repairs from" hint="Claims repaired earlier keep the old price" error={errors.priceEffectiveFrom?.message}>
          {(p) => <Input {...p} type="date" {...register('priceEffectiveFrom')} />}
        </Field>
        <Field label="Reason" hint="Needed when the date is in the past: filed claims change" error={errors.reason?.message}>
          {(p) => <Input {...p} {...register('reason')} />}
        </Field>
      </div>
      <DatedHistory title="Price history" items={history.data} show={(h) => formatCents(h.listPriceCents, 'USD')} />
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" className="size-4" {...register('returnRequired')} /> The failed part must be returned before the claim is paid
      </label>
      <ActiveCheckbox registration={register('active')} />
      <Button type="submit" pending={update.isPending}>
        Save
      </Button>
    </form>
  );
}
