import { useState } from 'react';
import { parseTypedNumber } from '@/lib/number-input';
import { implausibleReading } from '@shared/calculations/number-input';
import { useWatch, type UseFormReturn } from 'react-hook-form';
import type { CatalogModel } from '@shared/schemas/catalog';
import { judgeReading } from '@shared/calculations/readings';
import { num } from '@shared/calculations/format';
import { unitLabel, type UnitCode } from '@shared/calculations/units';
import { Badge } from '@/components/ui/badge';
import { Input, Select } from '@/components/ui/input';
import { fieldDomId, specPhases, type ClaimFormValues, type ReadingSlot, type ReadingUnit } from '../form-model';
import { GroupError } from './form-field';
import { FormSection } from './form-section';
import type { ReturnInfo } from './reviewer-note';
import { SafetyCautions } from './safety-cautions';

type Spec = CatalogModel['readingSpecs'][number];
type Reading = ClaimFormValues['readings'][number];

/** Units a technician may read a spec in: the same quantity, in the units the claim stores. */
export function unitsFor(specUnit: string): ReadingUnit[] {
  switch (specUnit) {
    case 'F':
    case 'C':
      return ['F', 'C'];
    case 'in':
    case 'mm':
      return ['in', 'mm'];
    case 'A':
      return ['A'];
    case 'V':
      return ['V'];
    default:
      return [];
  }
}

/** Partial input while typing ("-", "0.", "1,") that is not yet a number and not yet wrong. */
const UNFINISHED = /^-?\d*[.,]?$/;

/** One reading: text while typing ("0." stays "0."), a number in the form once it reads as one. */
function ReadingCell({ spec, phase, reading, unit, required, error, onChange }: { spec: Spec; phase: 'before' | 'after'; reading: Reading | undefined; unit: ReadingUnit; required: boolean; error?: string; onChange: (value: number | null) => void }) {
  const [text, setText] = useState(reading ? String(reading.value) : '');
  const [typo, setTypo] = useState<string | null>(null);
  const parsed = parseTypedNumber(text);
  const shownValue = reading && !typo && (!parsed.ok || parsed.value !== reading.value) ? String(reading.value) : text;
  const plausibility = reading ? implausibleReading(reading.value, reading.unit) : null;
  const shownError = typo ?? plausibility ?? error;
  const id = fieldDomId(`readings.${spec.key}.${phase}`);
  let verdict = null;
  if (reading) {
    try {
      const j = judgeReading({ value: reading.value, unit: reading.unit }, { unit: spec.unit, nominal: spec.nominal, tolerance: spec.tolerance, phase });
      verdict = (
        <span className="mt-1 flex flex-wrap items-center gap-1 text-xs text-ink-700">
          <Badge tone={j.pass ? 'green' : phase === 'after' ? 'red' : 'orange'}>{j.pass ? 'Within spec' : j.direction === 'low' ? 'Low' : 'High'}</Badge>
          {reading.unit !== spec.unit && (
            <span>
              = {num(j.convertedValue, 2)} {unitLabel(spec.unit as UnitCode)}
            </span>
          )}
        </span>
      );
    } catch {
      verdict = null;
    }
  }
  return (
    <div>
      <label htmlFor={id} className="block text-xs font-medium text-ink-700">
        {phase === 'before' ? 'Before repair' : 'After repair'}
        {required && <span className="text-red-800"> (required)</span>}
      </label>
      <div className="mt-0.5 flex items-center gap-1">
        <Input
          id={id}
          inputMode="decimal"
          autoComplete="off"
          value={shownValue}
          aria-invalid={shownError ? true : undefined}
          aria-describedby={shownError ? `${id}-error` : undefined}
          onChange={(e) => {
            // every keystroke is kept; a text that is not a number is said so, never trimmed into one
            const t = e.target.value;
            setText(t);
            if (t.trim() === '') {
              setTypo(null);
              onChange(null);
              return;
            }
            const p = parseTypedNumber(t);
            if (p.ok) {
              setTypo(null);
              onChange(p.value);
            } else {
              setTypo(UNFINISHED.test(t.trim()) ? null : p.message);
              onChange(null);
            }
          }}
          className="max-w-32"
        />
        <span className="text-sm text-ink-700">{unitLabel(unit)}</span>
      </div>
      {verdict}
      {shownError && (
        <p id={`${id}-error`} className="text-xs font-medium text-red-800">
          {shownError}
        </p>
      )}
    </div>
  );
}

export function ReadingsSection({
  form,
  specs,
  required,
  gas,
  note,
  problems,
}: {
  form: UseFormReturn<ClaimFormValues>;
  specs: readonly Spec[];
  required: readonly ReadingSlot[];
  gas: boolean;
  note?: ReturnInfo | null;
  /** Submit-check problems by path (readings.<key>.<phase>). */
  problems: Record<string, string>;
}) {
  const { control, setValue, getValues, formState } = form;
  const readings = useWatch({ control, name: 'readings' }) ?? [];
  const need = new Set(required.map((r) => `${r.key}:${r.phase}`));
  // Specs the repair codes require come first; the others may be entered as the technician has them.
  const ordered = [...specs].sort((a, b) => Number(specPhases(b).some((p) => need.has(`${a.key}:${p}`))) - Number(specPhases(a).some((p) => need.has(`${b.key}:${p}`))));
  const e = formState.errors.readings;
  const [openMore, setOpenMore] = useState(() => readings.some((r) => !required.some((q) => q.key === r.key)));

  const write = (next: Reading[]) => setValue('readings', next, { shouldDirty: true, shouldValidate: true });

  const setReading = (spec: Spec, phase: 'before' | 'after', unit: ReadingUnit, value: number | null) => {
    const current = getValues('readings') ?? [];
    const rest = current.filter((r) => !(r.key === spec.key && r.phase === phase));
    write(value === null ? rest : [...rest, { key: spec.key, phase, value, unit }]);
  };
  const setUnit = (spec: Spec, unit: ReadingUnit) => {
    write((getValues('readings') ?? []).map((r) => (r.key === spec.key ? { ...r, unit } : r)));
  };

  const renderSpec = (spec: Spec) => {
    const mine = readings.filter((r) => r.key === spec.key);
    const units = unitsFor(spec.unit);
    const unit = (mine[0]?.unit ?? (units.includes(spec.unit as ReadingUnit) ? spec.unit : units[0])) as ReadingUnit;
    const needed = specPhases(spec).some((p) => need.has(`${spec.key}:${p}`));
    return (
      <li key={spec.key} className="rounded-md border border-ink-100 p-3" aria-label={spec.label}>
        <div className="flex flex-wrap items-start justify-between gap-2">
          <div>
            <p className="text-sm font-medium text-ink-900">
              {spec.label}
              {needed && (
                <Badge tone="brass" className="ml-2">
                  Required for this repair
                </Badge>
              )}
            </p>
            <p className="text-xs text-ink-600">
              Specification {num(spec.nominal)} ± {num(spec.tolerance)} {unitLabel(spec.unit as UnitCode)}
            </p>
          </div>
          {units.length > 1 && (
            <label className="flex items-center gap-2 text-xs text-ink-700">
              Meter unit
              <Select value={unit} onChange={(ev) => setUnit(spec, ev.target.value as ReadingUnit)} className="min-h-9 w-24 text-sm" aria-label={`Unit for ${spec.label}`}>
                {units.map((u) => (
                  <option key={u} value={u}>
                    {unitLabel(u)}
                  </option>
                ))}
              </Select>
            </label>
          )}
        </div>
        <div className="mt-2 grid grid-cols-2 gap-3">
          {specPhases(spec).map((phase) => (
            <ReadingCell
              key={phase}
              spec={spec}
              phase={phase}
              unit={unit}
              reading={mine.find((r) => r.phase === phase)}
              required={need.has(`${spec.key}:${phase}`)}
              error={problems[`readings.${spec.key}.${phase}`]}
              onChange={(value) => setReading(spec, phase, unit, value)}
            />
          ))}
        </div>
      </li>
    );
  };

  // Required readings first; the model's other readings fold away (open when some were entered).
  const isRequired = (spec: Spec) => specPhases(spec).some((p) => need.has(`${spec.key}:${p}`));
  const shown = ordered.filter(isRequired);
  const more = ordered.filter((spec) => !isRequired(spec));

  return (
    <FormSection id="section-readings" title="Readings" description="Enter each reading in the unit your meter shows; it is converted to the specification’s unit and judged against its tolerance." note={note}>
      <SafetyCautions topic="readings" gas={gas} />
      {specs.length === 0 && <p className="text-sm text-ink-600">This model has no reading specifications.</p>}
      {shown.length > 0 && <ul className="space-y-3">{shown.map(renderSpec)}</ul>}
      {more.length > 0 && (
        <details className="rounded-md border border-ink-100" open={openMore || shown.length === 0 || undefined} onToggle={(ev) => setOpenMore((ev.target as HTMLDetailsElement).open)}>
          <summary className="cursor-pointer px-3 py-2.5 text-sm font-medium text-ink-800">
            {shown.length === 0 ? 'Readings of this model' : `Other readings of this model (optional): ${more.length}`}
          </summary>
          <ul className="space-y-3 border-t border-ink-100 p-3">{more.map(renderSpec)}</ul>
        </details>
      )}
      <GroupError>{Array.isArray(e) ? e.map((x) => x?.value?.message ?? x?.key?.message).filter(Boolean).join(' ') : (e?.message ?? e?.root?.message)}</GroupError>
    </FormSection>
  );
}
