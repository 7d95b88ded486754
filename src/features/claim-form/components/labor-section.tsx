import { useFieldArray, useWatch, type UseFormReturn } from 'react-hook-form';
import type { CatalogRepairCode } from '@shared/schemas/catalog';
import { Button } from '@/components/ui/button';
import { Input, Select } from '@/components/ui/input';
import { typedNumberValue } from '@/lib/number-input';
import { formatHours } from '@/lib/format';
import { fieldDomId, type ClaimFormValues } from '../form-model';
import { FormField, GroupError } from './form-field';
import { FormSection } from './form-section';
import type { ReturnInfo } from './reviewer-note';
import { SafetyCautions } from './safety-cautions';

export function LaborSection({
  form,
  repairCodes,
  gas,
  note,
}: {
  form: UseFormReturn<ClaimFormValues>;
  repairCodes: readonly CatalogRepairCode[];
  gas: boolean;
  note?: ReturnInfo | null;
}) {
  const { control, register, formState, getValues, setValue, clearErrors } = form;
  const { fields } = useFieldArray({ control, name: 'laborLines' });
  // Lines are added and removed through setValue: the field array's own append validates the
  // whole list at once, marking a line as wrong before the technician has touched it.
  const append = () => {
    const n = (getValues('laborLines') ?? []).length;
    setValue('laborLines', [...(getValues('laborLines') ?? []), { repairCodeId: '', hoursWorked: Number.NaN, overtime: false, note: '' }], { shouldDirty: true });
    setTimeout(() => document.getElementById(fieldDomId(`laborLines.${n}.repairCodeId`))?.focus(), 0);
  };
  const remove = (i: number) => {
    clearErrors('laborLines');
    setValue(
      'laborLines',
      (getValues('laborLines') ?? []).filter((_, j) => j !== i),
      { shouldDirty: true },
    );
  };
  const lines = useWatch({ control, name: 'laborLines' }) ?? [];
  const byId = new Map(repairCodes.map((c) => [c.id, c]));
  const anyOvertime = lines.some((l) => l?.overtime);
  const errors = formState.errors.laborLines;
  const listError = errors?.message ?? errors?.root?.message;

  return (
    <FormSection id="section-labor" title="Labor" description="One line per repair code of the labor-time guide for this unit’s family." note={note}>
      <SafetyCautions topic="repair" gas={gas} />
      {fields.length === 0 && <p className="text-sm text-ink-600">No labor lines yet.</p>}
      <ol className="space-y-4">
        {fields.map((field, i) => {
          const line = lines[i];
          const code = line ? byId.get(line.repairCodeId) : undefined;
          const over = code && typeof line?.hoursWorked === 'number' && line.hoursWorked > code.allowedHours ? line.hoursWorked - code.allowedHours : 0;
          const e = errors?.[i];
          return (
            <li key={field.id} className="rounded-md border border-ink-100 p-3" aria-label={`Labor line ${i + 1}`}>
              <div className="grid gap-3 sm:grid-cols-[minmax(0,3fr)_minmax(0,1fr)]">
                <FormField id={fieldDomId(`laborLines.${i}.repairCodeId`)} label="Repair code" error={e?.repairCodeId?.message}>
                  {(p) => (
                    <Select {...p} {...register(`laborLines.${i}.repairCodeId`)}>
                      <option value="">Choose the repair…</option>
                      {repairCodes.map((c) => (
                        <option key={c.id} value={c.id}>
                          {c.code} · {c.description} ({formatHours(c.allowedHours)} allowed)
                        </option>
                      ))}
                    </Select>
                  )}
                </FormField>
                <FormField
                  id={fieldDomId(`laborLines.${i}.hoursWorked`)}
                  label="Hours worked"
                  hint={code ? `Guide allows ${formatHours(code.allowedHours)}` : undefined}
                  error={e?.hoursWorked?.message}
                >
                  {(p) => <Input {...p} type="text" inputMode="decimal" autoComplete="off" {...register(`laborLines.${i}.hoursWorked`, { setValueAs: typedNumberValue })} />}
                </FormField>
              </div>
              {over > 0 && (
                <p className="mt-2 text-sm text-brass-700">
                  {formatHours(over)} over the time guide. The allowance is paid unless the reviewer accepts more: say why in the note.
                </p>
              )}
              <div className="mt-3 grid gap-3 sm:grid-cols-[auto_minmax(0,1fr)] sm:items-start">
                <label className="flex min-h-11 items-center gap-2 text-sm font-medium text-ink-800">
                  <input type="checkbox" className="size-5 accent-ink-700" {...register(`laborLines.${i}.overtime`)} />
                  Overtime
                </label>
                <FormField id={fieldDomId(`laborLines.${i}.note`)} label="Note for the reviewer" error={e?.note?.message}>
                  {(p) => <Input {...p} maxLength={500} {...register(`laborLines.${i}.note`)} />}
                </FormField>
              </div>
              <div className="mt-2 flex justify-end">
                <Button variant="ghost" size="sm" onClick={() => remove(i)}>
                  Remove line {i + 1}
                </Button>
              </div>
            </li>
          );
        })}
      </ol>
      <GroupError>{listError}</GroupError>
      <div>
        <Button id={fieldDomId('laborLines')} variant="secondary" onClick={append} disabled={fields.length >= 20}>
          Add a labor line
        </Button>
      </div>
      <FormField
        id={fieldDomId('preAuthorization')}
        label="Pre-authorisation number"
        hint={anyOvertime ? 'Overtime is paid at the overtime rate only with the manufacturer’s pre-authorisation number.' : 'Only needed for overtime.'}
        error={formState.errors.preAuthorization?.message}
        className="max-w-sm"
      >
        {(p) => <Input {...p} maxLength={60} autoComplete="off" {...register('preAuthorization', { setValueAs: (v: unknown) => (v === '' || v === undefined ? null : v) })} />}
      </FormField>
    </FormSection>
  );
}
