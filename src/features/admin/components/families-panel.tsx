import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { createFamilySchema, updateFamilySchema, type FamilyItem } from '@shared/schemas/admin';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input, Select } from '@/components/ui/input';
import { applyServerErrors } from '@/lib/form-errors';
import { ActiveCheckbox, CataloguePanel, StatusBadge } from './catalogue-panel';
import { useFamilies } from '../api/get-families';
import { useCreateFamily } from '../api/create-family';
import { useUpdateFamily } from '../api/update-family';

export function FamiliesPanel() {
  return (
    <CataloguePanel<FamilyItem>
      title="Product families"
      description="Retired families stay on old claims and certificates; they are not offered for new ones."
      caption="Product families"
      newLabel="New family"
      newTitle="New product family"
      editLabel={(f) => `Edit family ${f?.code ?? ''}`}
      query={useFamilies()}
      skeletonClassName="m-4 h-32"
      columns={[
        { header: 'Code', cellClassName: 'font-mono', cell: (f) => f.code },
        { header: 'Name', cell: (f) => f.name },
        { header: 'Fuel', cell: (f) => (f.fuel === 'gas' ? 'Gas' : 'Electric') },
        { header: 'Status', cell: (f) => <StatusBadge active={f.active} /> },
      ]}
      renderCreate={(done) => <CreateFamilyForm onDone={done} />}
      renderEdit={(f, done) => <EditFamilyForm family={f} onDone={done} />}
    />
  );
}

function CreateFamilyForm({ onDone }: { onDone: () => void }) {
  const create = useCreateFamily();
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<z.input<typeof createFamilySchema>, unknown, z.output<typeof createFamilySchema>>({
    resolver: zodResolver(createFamilySchema),
    defaultValues: { code: '', name: '', fuel: 'electric' },
  });
  const errors = formState.errors;
  const onSubmit = handleSubmit((v) => create.mutate(v, { onSuccess: onDone, onError: (e) => setFormError(applyServerErrors(e, setError, ['code', 'name', 'fuel'])) }));
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError && <Alert tone="error">{formError}</Alert>}
      <Field label="Code" hint="Fixed once created, e.g. FRY" error={errors.code?.message}>
        {(p) => <Input {...p} {...register('code')} />}
      </Field>
      <Field label="Name" error={errors.name?.message}>
        {(p) => <Input {...p} {...register('name')} />}
      </Field>
      <Field label="Fuel" error={errors.fuel?.message}>
        {(p) => (
          <Select {...p} {...register('fuel')}>
            <option value="electric">Electric</option>
            <option value="gas">Gas</option>
          </Select>
        )}
      </Field>
      <Button type="submit" pending={create.isPending}>
        Create the family
      </Button>
    </form>
  );
}

function EditFamilyForm({ family, onDone }: { family: FamilyItem; onDone: () => void }) {
  const update = useUpdateFamily();
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<z.input<typeof updateFamilySchema>, unknown, z.output<typeof updateFamilySchema>>({
    resolver: zodResolver(updateFamilySchema),
    defaultValues: { name: family.name, fuel: family.fuel, active: family.active },
  });
  const errors = formState.errors;
  const onSubmit = handleSubmit((v) =>
    update.mutate({ id: family.id, body: v }, { onSuccess: onDone, onError: (e) => setFormError(applyServerErrors(e, setError, ['name', 'fuel'])) }),
  );
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError && <Alert tone="error">{formError}</Alert>}
      <Field label="Name" error={errors.name?.message}>
        {(p) => <Input {...p} {...register('name')} />}
      </Field>
      <Field label="Fuel" error={errors.fuel?.message}>
        {(p) => (
          <Select {...p} {...register('fuel')}>
            <option value="electric">Electric</option>
            <option value="gas">Gas</option>
          </Select>
        )}
      </Field>
      <ActiveCheckbox registration={register('active')} />
      <Button type="submit" pending={update.isPending}>
        Save
      </Button>
    </form>
  );
}
