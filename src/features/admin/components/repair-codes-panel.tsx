import type { AffectedClaims } from '@shared/schemas/admin';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { attachmentRoleLabels, attachmentRoles } from '@shared/schemas/claim';
import { createRepairCodeSchema, updateRepairCodeSchema, type RepairCodeItem } from '@shared/schemas/admin';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input, Select } from '@/components/ui/input';
import { applyServerErrors } from '@/lib/form-errors';
import { ActiveCheckbox, AffectedClaimsNotice, CataloguePanel, DatedHistory, DatedValue, StatusBadge, today } from './catalogue-panel';
import { FamilyOptions } from './family-options';
import { formatHours } from '@/lib/format';
import { useRepairCodes } from '../api/get-repair-codes';
import { useCreateRepairCode } from '../api/create-repair-code';
import { useUpdateRepairCode } from '../api/update-repair-code';
import { useAllowanceHistory } from '../api/get-allowance-history';

/** The labor-time guide: allowed hours (effective-dated) and the evidence each repair needs. */
export function RepairCodesPanel() {
  return (
    <CataloguePanel<RepairCodeItem>
      title="Repair codes"
      description="A new allowance applies to claims repaired on or after its effective date; earlier repairs keep the allowance in force then."
      caption="Repair codes"
      newLabel="New repair code"
      newTitle="New repair code"
      editLabel={(c) => `Edit repair code ${c?.code ?? ''}`}
      query={useRepairCodes()}
      columns={[
        { header: 'Code', cellClassName: 'font-mono', cell: (c) => c.code },
        { header: 'Repair', cell: (c) => c.description },
        { header: 'Family', cell: (c) => c.familyCode },
        {
          header: 'Allowed today',
          className: 'text-right',
          cellClassName: 'text-right tabular-nums',
          cell: (c) => <DatedValue now={formatHours(c.allowedHours)} scheduled={c.scheduled} show={(s) => formatHours(s.allowedHours)} />,
        },
        { header: 'Required evidence', cellClassName: 'text-xs', cell: (c) => c.requiredEvidence.map((r) => attachmentRoleLabels[r]).join(', ') || '—' },
        { header: 'Status', cell: (c) => <StatusBadge active={c.active} /> },
      ]}
      renderCreate={(done) => <CreateRepairCodeForm onDone={done} />}
      renderEdit={(c, done) => <EditRepairCodeForm code={c} onDone={done} />}
    />
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
              <FamilyOptions blank="Choose…" />
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
      {affected && <AffectedClaimsNotice what="allowance" affected={affected} onClose={onDone} />}
      {formError && <Alert tone="error">{formError}</Alert>}
      <Field label="Repair" error={errors.description?.message}>
        {(p) => <Input {...p} {...register('description')} />}
      </Field>
      <Field label="Product family" error={errors.familyId?.message}>
        {(p) => (
          <Select {...p} {...register('familyId')}>
            <FamilyOptions />
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
      <DatedHistory title="Allowance history" items={history.data} show={(h) => formatHours(h.allowedHours)} />
      <EvidenceChecks register={register as never} />
      <ActiveCheckbox registration={register('active')} />
      <Button type="submit" pending={update.isPending}>
        Save
      </Button>
    </form>
  );
}
