import { useState } from 'react';
import { useFieldArray, useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { createModelSchema, createReadingSpecSchema, readingPhases, readingUnits, updateModelSchema, type ModelItem, type ReadingSpecItem } from '@shared/schemas/admin';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input, Select } from '@/components/ui/input';
import { errorMessage } from '@/lib/api-client';
import { applyServerErrors } from '@/lib/form-errors';
import { FamilyOptions } from './family-options';
import { CataloguePanel, StatusBadge } from './catalogue-panel';
import { useModels } from '../api/get-models';
import { useParts } from '../api/get-parts';
import { useCreateModel } from '../api/create-model';
import { useUpdateModel } from '../api/update-model';
import { useCreateReadingSpec } from '../api/create-reading-spec';
import { useUpdateReadingSpec } from '../api/update-reading-spec';
import { useDeleteReadingSpec } from '../api/delete-reading-spec';

const phaseLabel: Record<(typeof readingPhases)[number], string> = { before: 'Before repair', after: 'After repair', both: 'Before and after' };

/** Models with their warranty terms, longer component terms and the readings a repair needs. */
export function ModelsPanel() {
  return (
    <CataloguePanel<ModelItem>
      title="Models"
      description="Terms in months: parts and labor count from the install date, the cap from the ship date."
      caption="Models"
      newLabel="New model"
      newTitle="New model"
      editLabel={(m) => `Edit model ${m?.modelNumber ?? ''}`}
      query={useModels()}
      columns={[
        { header: 'Model', cellClassName: 'font-mono', cell: (m) => m.modelNumber },
        { header: 'Name', cell: (m) => m.name },
        { header: 'Family', cell: (m) => m.familyCode },
        {
          header: 'Parts / labor / cap',
          className: 'text-right',
          cellClassName: 'text-right tabular-nums',
          cell: (m) => (
            <>
              {m.partsMonths} / {m.laborMonths} / {m.capMonthsFromShip} mo
              {m.componentTerms.length > 0 && <span className="block text-xs text-ink-600">{m.componentTerms.length} longer component term(s)</span>}
            </>
          ),
        },
        { header: 'Readings', className: 'text-right', cell: (m) => m.readingSpecs.length },
        { header: 'Status', cell: (m) => <StatusBadge active={m.active} /> },
      ]}
      renderCreate={(done) => <ModelForm onDone={done} />}
      renderEdit={(m, done) => (
        <div className="space-y-6">
          <ModelForm model={m} onDone={done} />
          <ReadingSpecs model={m} />
        </div>
      )}
    />
  );
}

type ModelValues = z.input<typeof createModelSchema>;
const modelFields = ['familyId', 'modelNumber', 'name', 'partsMonths', 'laborMonths', 'capMonthsFromShip', 'installGraceDays', 'componentTerms'] as const;

function ModelForm({ model, onDone }: { model?: ModelItem; onDone: () => void }) {
  const parts = useParts();
  const create = useCreateModel();
  const update = useUpdateModel();
  const [formError, setFormError] = useState<string | null>(null);
  const [active, setActive] = useState(model?.active ?? true);
  const { register, control, handleSubmit, setError, formState } = useForm<ModelValues, unknown, z.output<typeof createModelSchema>>({
    // Editing checks the same fields; the model number is only sent on creation.
    resolver: zodResolver(createModelSchema),
    defaultValues: model
      ? {
          familyId: model.familyId,
          modelNumber: model.modelNumber,
          name: model.name,
          partsMonths: model.partsMonths,
          laborMonths: model.laborMonths,
          capMonthsFromShip: model.capMonthsFromShip,
          installGraceDays: model.installGraceDays,
          componentTerms: model.componentTerms.map((c) => ({ partId: c.partId, label: c.label, partsMonths: c.partsMonths })) }
      : { familyId: '', modelNumber: '', name: '', installGraceDays: 90, componentTerms: [] },
  });
  const comps = useFieldArray({ control, name: 'componentTerms' });
  const errors = formState.errors;
  const onSubmit = handleSubmit((v) => {
    const fail = (e: unknown) => setFormError(applyServerErrors(e, setError, modelFields));
    if (model) {
      const { modelNumber: _n, ...rest } = v;
      const body: z.infer<typeof updateModelSchema> = { ...rest, active };
      update.mutate({ id: model.id, body }, { onSuccess: onDone, onError: fail });
    } else create.mutate(v, { onSuccess: onDone, onError: fail });
  });
  const num = { valueAsNumber: true } as const;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Model and warranty terms">
      {formError && <Alert tone="error">{formError}</Alert>}
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Model number" hint={model ? 'Fixed once created' : undefined} error={errors.modelNumber?.message}>
          {(p) => <Input {...p} disabled={!!model} {...register('modelNumber')} />}
        </Field>
        <Field label="Product family" error={errors.familyId?.message}>
          {(p) => (
            <Select {...p} {...register('familyId')}>
              <FamilyOptions blank="Choose…" />
            </Select>
          )}
        </Field>
      </div>
      <Field label="Name" error={errors.name?.message}>
        {(p) => <Input {...p} {...register('name')} />}
      </Field>
      <div className="grid gap-4 sm:grid-cols-4">
        <Field label="Parts (months)" error={errors.partsMonths?.message}>
          {(p) => <Input {...p} inputMode="numeric" {...register('partsMonths', num)} />}
        </Field>
        <Field label="Labor (months)" error={errors.laborMonths?.message}>
          {(p) => <Input {...p} inputMode="numeric" {...register('laborMonths', num)} />}
        </Field>
        <Field label="Cap from ship (months)" error={errors.capMonthsFromShip?.message}>
          {(p) => <Input {...p} inputMode="numeric" {...register('capMonthsFromShip', num)} />}
        </Field>
        <Field label="Install grace (days)" error={errors.installGraceDays?.message}>
          {(p) => <Input {...p} inputMode="numeric" {...register('installGraceDays', num)} />}
        </Field>
      </div>
      <fieldset className="space-y-2">
        <legend className="text-sm font-medium text-ink-800">Longer parts-only terms on components</legend>
        {errors.componentTerms?.message && <p className="text-sm font-medium text-red-800">{errors.componentTerms.message}</p>}
        {comps.fields.map((f, i) => (
          <div key={f.id} className="grid items-end gap-2 sm:grid-cols-[2fr_2fr_1fr_auto]">
            <Field label="Part" error={errors.componentTerms?.[i]?.partId?.message}>
              {(p) => (
                <Select {...p} {...register(`componentTerms.${i}.partId`)}>
                  <option value="">Choose…</option>
                  {(parts.data ?? []).map((pt) => (
                    <option key={pt.id} value={pt.id}>
                      {pt.partNumber} · {pt.description}
                    </option>
                  ))}
                </Select>
              )}
            </Field>
            <Field label="Component" error={errors.componentTerms?.[i]?.label?.message}>
              {(p) => <Input {...p} {...register(`componentTerms.${i}.label`)} />}
            </Field>
            <Field label="Months" error={errors.componentTerms?.[i]?.partsMonths?.message}>
              {(p) => <Input {...p} inputMode="numeric" {...register(`componentTerms.${i}.partsMonths`, num)} />}
            </Field>
            <Button variant="ghost" onClick={() => comps.remove(i)}>
              Remove
            </Button>
          </div>
        ))}
        <Button variant="secondary" size="sm" onClick={() => comps.append({ partId: '', label: '', partsMonths: 60 })}>
          Add a component term
        </Button>
      </fieldset>
      {model && (
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" className="size-4" checked={active} onChange={(e) => setActive(e.target.checked)} /> Active (untick to retire)
        </label>
      )}
      <Button type="submit" pending={create.isPending || update.isPending}>
        {model ? 'Save the model' : 'Create the model'}
      </Button>
    </form>
  );
}

type SpecValues = z.input<typeof createReadingSpecSchema>;
const specFields = ['key', 'label', 'unit', 'nominal', 'tolerance', 'phase', 'requiredForCodes'] as const;

function ReadingSpecs({ model }: { model: ModelItem }) {
  const [editing, setEditing] = useState<ReadingSpecItem | 'new' | null>(null);
  const remove = useDeleteReadingSpec();
  const [note, setNote] = useState<string | null>(null);
  return (
    <section className="space-y-3" aria-label="Reading specs">
      <h3 className="font-semibold text-ink-900">Readings for {model.modelNumber}</h3>
      {note && <Alert tone="error">{note}</Alert>}
      <ul className="divide-y divide-ink-100 rounded-md border border-ink-100 text-sm">
        {model.readingSpecs.length === 0 && <li className="px-3 py-2 text-ink-600">No readings are specified.</li>}
        {model.readingSpecs.map((s) => (
          <li key={s.id} className="flex flex-wrap items-center gap-2 px-3 py-2">
            <span className="min-w-0 flex-1">
              <span className="font-medium">{s.label}</span> · {s.nominal} ± {s.tolerance} {s.unit} · {phaseLabel[s.phase]}
              {s.requiredForCodes.length > 0 && <span className="block text-xs text-ink-600">Required for {s.requiredForCodes.join(', ')}</span>}
            </span>
            <Button size="sm" variant="ghost" onClick={() => setEditing(s)}>
              Edit
            </Button>
            <Button
              size="sm"
              variant="ghost"
              onClick={() => {
                setNote(null);
                remove.mutate({ modelId: model.id, specId: s.id }, { onError: (e) => setNote(errorMessage(e)) });
              }}
            >
              Remove
            </Button>
          </li>
        ))}
      </ul>
      {editing === null ? (
        <Button variant="secondary" size="sm" onClick={() => setEditing('new')}>
          Add a reading
        </Button>
      ) : (
        <ReadingSpecForm key={editing === 'new' ? 'new' : editing.id} modelId={model.id} spec={editing === 'new' ? undefined : editing} onDone={() => setEditing(null)} />
      )}
    </section>
  );
}

function ReadingSpecForm({ modelId, spec, onDone }: { modelId: string; spec?: ReadingSpecItem; onDone: () => void }) {
  const create = useCreateReadingSpec();
  const update = useUpdateReadingSpec();
  const [formError, setFormError] = useState<string | null>(null);
  const [codesText, setCodesText] = useState((spec?.requiredForCodes ?? []).join(', '));
  const { register, handleSubmit, setError, setValue, formState } = useForm<SpecValues, unknown, z.output<typeof createReadingSpecSchema>>({
    resolver: zodResolver(createReadingSpecSchema),
    defaultValues: spec
      ? { key: spec.key, label: spec.label, unit: spec.unit, nominal: spec.nominal, tolerance: spec.tolerance, phase: spec.phase, requiredForCodes: spec.requiredForCodes }
      : { key: '', label: '', unit: 'F', phase: 'both', requiredForCodes: [] },
  });
  const errors = formState.errors;
  const onSubmit = handleSubmit((v) => {
    const fail = (e: unknown) => setFormError(applyServerErrors(e, setError, specFields));
    if (spec) {
      const { key: _k, ...body } = v;
      update.mutate({ modelId, specId: spec.id, body }, { onSuccess: onDone, onError: fail });
    } else create.mutate({ id: modelId, body: v }, { onSuccess: onDone, onError: fail });
  });
  const num = { valueAsNumber: true } as const;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3 rounded-md border border-ink-100 p-3" aria-label={spec ? 'Edit the reading' : 'Add a reading'}>
      {formError && <Alert tone="error">{formError}</Alert>}
      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="Key" hint="e.g. oil_temp; fixed once created" error={errors.key?.message}>
          {(p) => <Input {...p} disabled={!!spec} {...register('key')} />}
        </Field>
        <Field label="Label" error={errors.label?.message}>
          {(p) => <Input {...p} {...register('label')} />}
        </Field>
      </div>
      <div className="grid gap-3 sm:grid-cols-4">
        <Field label="Unit" error={errors.unit?.message}>
          {(p) => (
            <Select {...p} {...register('unit')}>
              {readingUnits.map((u) => (
                <option key={u} value={u}>
                  {u === 'F' ? '°F' : u === 'C' ? '°C' : u}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="Nominal" error={errors.nominal?.message}>
          {(p) => <Input {...p} inputMode="decimal" {...register('nominal', num)} />}
        </Field>
        <Field label="Tolerance (±)" error={errors.tolerance?.message}>
          {(p) => <Input {...p} inputMode="decimal" {...register('tolerance', num)} />}
        </Field>
        <Field label="When" error={errors.phase?.message}>
          {(p) => (
            <Select {...p} {...register('phase')}>
              {readingPhases.map((ph) => (
                <option key={ph} value={ph}>
                  {phaseLabel[ph]}
                </option>
              ))}
            </Select>
          )}
        </Field>
      </div>
      <Field label="Required for repair codes" hint="Comma-separated, e.g. FR-210, FR-220" error={errors.requiredForCodes?.message}>
        {(p) => (
          <Input
            {...p}
            value={codesText}
            onChange={(e) => {
              setCodesText(e.target.value);
              setValue(
                'requiredForCodes',
                e.target.value
                  .split(',')
                  .map((s) => s.trim().toUpperCase())
                  .filter(Boolean),
              );
            }}
          />
        )}
      </Field>
      <div className="flex gap-2">
        <Button type="submit" size="sm" pending={create.isPending || update.isPending}>
          {spec ? 'Save the reading' : 'Add the reading'}
        </Button>
        <Button variant="ghost" size="sm" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
