import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { createFamilySchema, updateFamilySchema, type FamilyItem } from '@shared/schemas/admin';
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
import { useFamilies } from '../api/get-families';
import { useCreateFamily } from '../api/create-family';
import { useUpdateFamily } from '../api/update-family';
import { Modal } from '@/components/ui/modal';

export function FamiliesPanel() {
  const families = useFamilies();
  const [editing, setEditing] = useState<FamilyItem | 'new' | null>(null);
  return (
    <Card>
      <CardHeader title="Product families" description="Retired families stay on old claims and certificates; they are not offered for new ones." actions={<Button onClick={() => setEditing('new')}>New family</Button>} />
      {families.isPending && <Skeleton className="m-4 h-32" />}
      {families.isError && (
        <CardBody>
          <Alert tone="error">{errorMessage(families.error)}</Alert>
        </CardBody>
      )}
      {families.data && (
        <Table caption="Product families">
          <THead>
            <Tr>
              <Th>Code</Th>
              <Th>Name</Th>
              <Th>Fuel</Th>
              <Th>Status</Th>
              <Th>
                Actions
              </Th>
            </Tr>
          </THead>
          <TBody>
            {families.data.map((f) => (
              <Tr key={f.id}>
                <Td className="font-mono">{f.code}</Td>
                <Td>{f.name}</Td>
                <Td>{f.fuel === 'gas' ? 'Gas' : 'Electric'}</Td>
                <Td>{f.active ? <Badge tone="green">Active</Badge> : <Badge tone="slate">Retired</Badge>}</Td>
                <Td className="text-right">
                  <Button size="sm" variant="secondary" onClick={() => setEditing(f)} aria-label={`Edit family ${f.code}`}>
                    Edit
                  </Button>
                </Td>
              </Tr>
            ))}
          </TBody>
        </Table>
      )}
      <Modal open={editing !== null} onClose={() => setEditing(null)} title={editing === 'new' ? 'New product family' : `Edit family ${editing?.code ?? ''}`}>
        {editing === 'new' && <CreateFamilyForm onDone={() => setEditing(null)} />}
        {editing && editing !== 'new' && <EditFamilyForm family={editing} onDone={() => setEditing(null)} />}
      </Modal>
    </Card>
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
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" className="size-4" {...register('active')} /> Active (untick to retire)
      </label>
      <Button type="submit" pending={update.isPending}>
        Save
      </Button>
    </form>
  );
}
