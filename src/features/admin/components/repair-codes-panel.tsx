import type { AffectedClaims } from '@shared/schemas/admin';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { attachmentRoleLabels, attachmentRoles } from '@shared/schemas/claim';
import { createRepairCodeSchema, updateRepairCodeSchema, type RepairCodeItem } from '@shared/schemas/admin';
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
import { formatDate, formatHours } from '@/lib/format';
import { useRepairCodes } from '../api/get-repair-codes';
import { useFamilies } from '../api/get-families';
import { useCreateRepairCode } from '../api/create-repair-code';
import { useUpdateRepairCode } from '../api/update-repair-code';
import { useAllowanceHistory } from '../api/get-allowance-history';
import { Modal } from '@/components/ui/modal';

const HISTORY_START = '0001-01-01';
const since = (d: string) => (d === HISTORY_START ? 'from the start' : `from ${formatDate(d)}`);
const today = () => new Date().toISOString().slice(0, 10);

/** The labor-time guide: allowed hours (effective-dated) and the evidence each repair needs. */
export function RepairCodesPanel() {
  const codes = useRepairCodes();
  const [editing, setEditing] = useState<RepairCodeItem | 'new' | null>(null);
  return (
    <Card>
      <CardHeader
        title="Repair codes"
        description="A new allowance applies to claims repaired on or after its effective date; earlier repairs keep the allowance in force then."
        actions={<Button onClick={() => setEditing('new')}>New repair code</Button>}
      />
      {codes.isPending && <Skeleton className="m-4 h-40" />}
      {codes.isError && (
        <CardBody>
          <Alert tone="error">{errorMessage(codes.error)}</Alert>
        </CardBody>
      )}
      {codes.data && (
        <Table caption="Repair codes">
          <THead>
            <Tr>
              <Th>Code</Th>
              <Th>Repair</Th>
              <Th>Family</Th>
              <Th className="text-right">Allowed today</Th>
              <Th>Required evidence</Th>
              <Th>Status</Th>
              <Th>
                Actions
              </Th>
            </Tr>
          </THead>
          <TBody>
            {codes.data.map((c) => (
              <Tr key={c.id}>
                <Td className="font-mono">{c.code}</Td>
                <Td>{c.description}</Td>
                <Td>{c.familyCode}</Td>
                <Td className="text-right tabular-nums">
                  {formatHours(c.allowedHours)}
                  {c.scheduled.map((s) => (
                    <span key={s.effectiveFrom} className="block text-xs text-brass-700">
                      {formatHours(s.allowedHours)} {since(s.effectiveFrom)}
                    </span>
                  ))}
                </Td>
                <Td className="text-xs">{c.requiredEvidence.map((r) => attachmentRoleLabels[r]).join(', ') || '—'}</Td>
                <Td>{c.active ? <Badge tone="green">Active</Badge> : <Badge tone="slate">Retired</Badge>}</Td>
                <Td className="text-right">
                  <Button size="sm" variant="secondary" onClick={() => setEditing(c)} aria-label={`Edit repair code ${c.code}`}>
                    Edit
                  </Button>
                </Td>
              </Tr>
            ))}
          </TBody>
        </Table>
      )}
      <Modal open={editing !== null} onClose={() => setEditing(null)} title={editing === 'new' ? 'New repair code' : `Edit repair code ${editing?.code ?? ''}`}>
        {editing === 'new' && <CreateRepairCodeForm onDone={() => setEditing(null)} />}
        {editing && editing !== 'new' && <EditRepairCodeForm code={editing} onDone={() => setEditing(null)} />}
      </Modal>
    </Card>
  );
}

function EvidenceChecks({ register }: { register: (name: 'requiredEvidence') => object }) {
  return (
    <fieldset className="space-y-1">
      <legend className="text-sm font-medium text-ink-800">Required evidence</legend>
      <div className="grid gap-1 sm:grid-cols-2">
        {attachmentRoles.map((r) => (
          <label key={r} className="flex items-center gap-2 text-sm">
            <input type="checkbox" className="size-4" value={r} {...register('requiredEvidence')} /> {attachmentRoleLabels[r]}
          </label>
        ))}
      </div>
    </fieldset>
  );
}

function CreateRepairCodeForm({ onDone }: { onDone: () => void }) {
  const families = useFamilies();
  const create = useCreateRepairCode();
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<z.input<typeof createRepairCodeSchema>, unknown, z.output<typeof createRepairCodeSchema>>({
    resolver: zodResolver(createRepairCodeSchema),
    defaultValues: { code: '', familyId: '', description: '', requiredEvidence: ['serial_plate'] },
  });
  const errors = formState.errors;
  const onSubmit = handleSubmit((v) =>
    create.mutate(v, { onSuccess: onDone, onError: (e) => setFormError(applyServerErrors(e, setError, ['code', 'familyId', 'description', 'allowedHours', 'requiredEvidence'])) }),
  );
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError && <Alert tone="error">{formError}</Alert>}
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Code" hint="Fixed once created" error={errors.code?.message}>
          {(p) => <Input {...p} {...register('code')} />}
        </Field>
        <Field label="Product family" error={errors.familyId?.message}>
          {(p) => (
            <Select {...p} {...register('familyId')}>
              <option value="">Choose…</option>
              {(families.data ?? []).map((f) => (
                <option key={f.id} value={f.id}>
                  {f.code} · {f.name}
                </option>
              ))}
            </Select>
          )}
        </Field>
      </div>
      <Field label="Repair" error={errors.description?.message}>
        {(p) => <Input {...p} {...register('description')} />}
      </Field>
      <Field label="Allowed hours" error={errors.allowedHours?.message}>
        {(p) => <Input {...p} inputMode="decimal" {...register('allowedHours', { valueAsNumber: true })} />}
      </Field>
      <EvidenceChecks register={register as never} />
      <Button type="submit" pending={create.isPending}>
        Create the repair code
      </Button>
    </form>
  );
}

function EditRepairCodeForm({ code, onDone }: { code: RepairCodeItem; onDone: () => void }) {
  const families = useFamilies();
  const history = useAllowanceHistory(code.id);
  const update = useUpdateRepairCode();
  const [affected, setAffected] = useState<AffectedClaims | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<z.input<typeof updateRepairCodeSchema>, unknown, z.output<typeof updateRepairCodeSchema>>({
    resolver: zodResolver(updateRepairCodeSchema),
    defaultValues: {
      familyId: code.familyId,
      description: code.description,
      requiredEvidence: code.requiredEvidence,
      active: code.active,
      allowedHours: code.allowedHours,
      allowanceEffectiveFrom: today(),
    },
  });
  const errors = formState.errors;
  const onSubmit = handleSubmit((v) => {
    // An unchanged allowance is not a change: leave the dated history alone.
    const body = v.allowedHours === code.allowedHours && !formState.dirtyFields.allowanceEffectiveFrom ? { ...v, allowedHours: undefined, allowanceEffectiveFrom: undefined } : v;
    update.mutate(
      { id: code.id, body },
      { onSuccess: (item) => (item.affectedClaims ? setAffected(item.affectedClaims) : onDone()), onError: (e) => setFormError(applyServerErrors(e, setError, ['familyId', 'description', 'allowedHours', 'allowanceEffectiveFrom', 'requiredEvidence', 'reason'])) },
    );
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {affected && (
        <Alert tone="info">
          Saved. The allowance takes effect from {affected.effectiveFrom} and changes {affected.count} filed {affected.count === 1 ? 'claim' : 'claims'}
          {affected.numbers.length > 0 ? `: ${affected.numbers.join(', ')}${affected.count > affected.numbers.length ? ' and more' : ''}` : ''}.{' '}
          <button type="button" className="underline" onClick={onDone}>
            Close
          </button>
        </Alert>
      )}
      {formError && <Alert tone="error">{formError}</Alert>}
      <Field label="Repair" error={errors.description?.message}>
        {(p) => <Input {...p} {...register('description')} />}
      </Field>
      <Field label="Product family" error={errors.familyId?.message}>
        {(p) => (
          <Select {...p} {...register('familyId')}>
            {(families.data ?? []).map((f) => (
              <option key={f.id} value={f.id}>
                {f.code} · {f.name}
              </option>
            ))}
          </Select>
        )}
      </Field>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Allowed hours" error={errors.allowedHours?.message}>
          {(p) => <Input {...p} inputMode="decimal" {...register('allowedHours', { valueAsNumber: true })} />}
        </Field>
        <Field label="Applies to repairs from" hint="Claims repaired earlier keep the old allowance" error={errors.allowanceEffectiveFrom?.message}>
          {(p) => <Input {...p} type="date" {...register('allowanceEffectiveFrom')} />}
        </Field>
        <Field label="Reason" hint="Needed when the date is in the past: filed claims change" error={errors.reason?.message}>
          {(p) => <Input {...p} {...register('reason')} />}
        </Field>
      </div>
      {history.data && history.data.length > 0 && (
        <div className="text-sm">
          <p className="font-medium text-ink-800">Allowance history</p>
          <ul className="text-ink-700">
            {history.data.map((h) => (
              <li key={h.effectiveFrom}>
                {formatHours(h.allowedHours)} {since(h.effectiveFrom)}
              </li>
            ))}
          </ul>
        </div>
      )}
      <EvidenceChecks register={register as never} />
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" className="size-4" {...register('active')} /> Active (untick to retire)
      </label>
      <Button type="submit" pending={update.isPending}>
        Save
      </Button>
    </form>
  );
}
