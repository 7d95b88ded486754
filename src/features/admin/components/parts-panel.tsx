import type { AffectedClaims } from '@shared/schemas/admin';
import { useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { createPartSchema, updatePartSchema, type PartItem } from '@shared/schemas/admin';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Field } from '@/components/ui/field';
import { Input, Select } from '@/components/ui/input';
import { Skeleton } from '@/components/ui/skeleton';
import { Table, TBody, Td, Th, THead, Tr } from '@/components/ui/table';
import { errorMessage } from '@/lib/api-client';
import { applyServerErrors } from '@/lib/form-errors';
import { formatCents, formatDate } from '@/lib/format';
import { useParts } from '../api/get-parts';
import { useFamilies } from '../api/get-families';
import { useCreatePart } from '../api/create-part';
import { useUpdatePart } from '../api/update-part';
import { usePriceHistory } from '../api/get-price-history';
import { Modal } from '@/components/ui/modal';
import { MoneyInput } from './money-input';

const HISTORY_START = '0001-01-01';
const since = (d: string) => (d === HISTORY_START ? 'from the start' : `from ${formatDate(d)}`);
const today = () => new Date().toISOString().slice(0, 10);

/** Parts with their list price (effective-dated) and whether the failed part must come back. */
export function PartsPanel() {
  const parts = useParts();
  const [editing, setEditing] = useState<PartItem | 'new' | null>(null);
  return (
    <Card>
      <CardHeader
        title="Parts"
        description="A new list price applies to claims repaired on or after its effective date."
        actions={<Button onClick={() => setEditing('new')}>New part</Button>}
      />
      {parts.isPending && <Skeleton className="m-4 h-40" />}
      {parts.isError && (
        <CardBody>
          <Alert tone="error">{errorMessage(parts.error)}</Alert>
        </CardBody>
      )}
      {parts.data && (
        <Table caption="Parts">
          <THead>
            <Tr>
              <Th>Part number</Th>
              <Th>Description</Th>
              <Th>Family</Th>
              <Th className="text-right">List price today</Th>
              <Th>Return</Th>
              <Th>Status</Th>
              <Th>
                Actions
              </Th>
            </Tr>
          </THead>
          <TBody>
            {parts.data.map((p) => (
              <Tr key={p.id}>
                <Td className="font-mono">{p.partNumber}</Td>
                <Td>{p.description}</Td>
                <Td>{p.familyCode ?? 'Any'}</Td>
                <Td className="text-right tabular-nums">
                  {formatCents(p.listPriceCents, 'USD')}
                  {p.scheduled.map((s) => (
                    <span key={s.effectiveFrom} className="block text-xs text-brass-700">
                      {formatCents(s.listPriceCents, 'USD')} {since(s.effectiveFrom)}
                    </span>
                  ))}
                </Td>
                <Td>{p.returnRequired ? <Badge tone="orange">Required</Badge> : '—'}</Td>
                <Td>{p.active ? <Badge tone="green">Active</Badge> : <Badge tone="slate">Retired</Badge>}</Td>
                <Td className="text-right">
                  <Button size="sm" variant="secondary" onClick={() => setEditing(p)} aria-label={`Edit part ${p.partNumber}`}>
                    Edit
                  </Button>
                </Td>
              </Tr>
            ))}
          </TBody>
        </Table>
      )}
      <Modal open={editing !== null} onClose={() => setEditing(null)} title={editing === 'new' ? 'New part' : `Edit part ${editing?.partNumber ?? ''}`}>
        {editing === 'new' && <CreatePartForm onDone={() => setEditing(null)} />}
        {editing && editing !== 'new' && <EditPartForm part={editing} onDone={() => setEditing(null)} />}
      </Modal>
    </Card>
  );
}

function FamilyOptions() {
  const families = useFamilies();
  return (
    <>
      <option value="">Any family</option>
      {(families.data ?? []).map((f) => (
        <option key={f.id} value={f.id}>
          {f.code} · {f.name}
        </option>
      ))}
    </>
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
            <FamilyOptions />
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
      {affected && (
        <Alert tone="info">
          Saved. The price takes effect from {affected.effectiveFrom} and changes {affected.count} filed {affected.count === 1 ? 'claim' : 'claims'}
          {affected.numbers.length > 0 ? `: ${affected.numbers.join(', ')}${affected.count > affected.numbers.length ? ' and more' : ''}` : ''}.{' '}
          <button type="button" className="underline" onClick={onDone}>
            Close
          </button>
        </Alert>
      )}
      {formError && <Alert tone="error">{formError}</Alert>}
      <Field label="Description" error={errors.description?.message}>
        {(p) => <Input {...p} {...register('description')} />}
      </Field>
      <Field label="Product family" error={errors.familyId?.message}>
        {(p) => (
          <Select {...p} {...register('familyId', familyValue)}>
            <FamilyOptions />
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
      {history.data && history.data.length > 0 && (
        <div className="text-sm">
          <p className="font-medium text-ink-800">Price history</p>
          <ul className="text-ink-700">
            {history.data.map((h) => (
              <li key={h.effectiveFrom}>
                {formatCents(h.listPriceCents, 'USD')} {since(h.effectiveFrom)}
              </li>
            ))}
          </ul>
        </div>
      )}
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" className="size-4" {...register('returnRequired')} /> The failed part must be returned before the claim is paid
      </label>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" className="size-4" {...register('active')} /> Active (untick to retire)
      </label>
      <Button type="submit" pending={update.isPending}>
        Save
      </Button>
    </form>
  );
}
