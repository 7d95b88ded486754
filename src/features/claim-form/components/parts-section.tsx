import { useEffect, useId, useRef, useState, type KeyboardEvent } from 'react';
import { useFieldArray, useWatch, type UseFormReturn } from 'react-hook-form';
import type { CatalogModel, CatalogPart } from '@shared/schemas/catalog';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { typedNumberValue } from '@/lib/number-input';
import { formatCents } from '@/lib/format';
import { fieldDomId, type ClaimFormValues } from '../form-model';
import { FormField, GroupError } from './form-field';
import { FormSection } from './form-section';
import type { ReturnInfo } from './reviewer-note';

function matches(p: CatalogPart, q: string): boolean {
  const words = q.toLowerCase().split(/\s+/).filter(Boolean);
  const text = `${p.partNumber} ${p.description}`.toLowerCase();
  return words.every((w) => text.includes(w));
}

/**
 * Search the catalogue by part number or words of the description; a result adds a line.
 * A combobox with a listbox of results (WAI-ARIA APG pattern): ArrowDown/ArrowUp move the
 * active option (aria-activedescendant), Enter adds it, Escape closes the list and clears the text.
 */
export function PartPicker({ parts, currency, onPick }: { parts: readonly CatalogPart[]; currency: string; onPick: (p: CatalogPart) => void }) {
  const [q, setQ] = useState('');
  const [active, setActive] = useState(-1);
  const listId = useId();
  const results = q.trim() === '' ? [] : parts.filter((p) => matches(p, q)).slice(0, 8);
  const open = results.length > 0;
  const optionId = (i: number) => `${listId}-option-${i}`;
  const pick = (p: CatalogPart) => {
    setQ('');
    setActive(-1);
    onPick(p);
  };
  const onKeyDown = (e: KeyboardEvent<HTMLInputElement>) => {
    if (e.key === 'ArrowDown') {
      if (!open) return;
      e.preventDefault();
      setActive((a) => (a + 1) % results.length);
    } else if (e.key === 'ArrowUp') {
      if (!open) return;
      e.preventDefault();
      setActive((a) => (a <= 0 ? results.length - 1 : a - 1));
    } else if (e.key === 'Enter') {
      // Enter never submits the claim form from the search field
      e.preventDefault();
      const chosen = results[active] ?? (results.length === 1 ? results[0] : undefined);
      if (chosen) pick(chosen);
    } else if (e.key === 'Escape') {
      if (q === '') return;
      e.preventDefault();
      setQ('');
      setActive(-1);
    }
  };
  return (
    <div className="space-y-2">
      <FormField id={fieldDomId('partLines')} label="Add a part" hint="Type a part number or words of its name; arrow keys choose, Enter adds.">
        {(p) => (
          <Input
            {...p}
            type="text"
            role="combobox"
            aria-autocomplete="list"
            aria-expanded={open}
            aria-controls={listId}
            aria-activedescendant={open && active >= 0 ? optionId(active) : undefined}
            value={q}
            onChange={(e) => {
              setQ(e.target.value);
              setActive(-1);
            }}
            onKeyDown={onKeyDown}
            autoComplete="off"
          />
        )}
      </FormField>
      <ul id={listId} role="listbox" aria-label="Matching parts" className="divide-y divide-ink-100 rounded-md border border-ink-100 empty:hidden">
        {results.map((p, i) => (
          <li
            key={p.id}
            id={optionId(i)}
            role="option"
            aria-selected={i === active}
            className={`flex w-full cursor-pointer flex-wrap items-center justify-between gap-2 px-3 py-2.5 text-left text-sm hover:bg-paper ${i === active ? 'bg-paper outline-2 -outline-offset-2 outline-ink-600' : ''}`}
            onMouseDown={(e) => e.preventDefault()}
            onClick={() => pick(p)}
          >
            <span className="min-w-0 break-words">
              <span className="font-mono font-medium">{p.partNumber}</span> {p.description}
            </span>
            <span className="flex items-center gap-2">
              {p.returnRequired && <Badge tone="orange">Return required</Badge>}
              <span className="tabular-nums text-ink-700">{formatCents(p.listPriceCents, currency)}</span>
            </span>
          </li>
        ))}
      </ul>
      {q.trim() !== '' && results.length === 0 && <p className="text-sm text-ink-600">No part of this family matches “{q.trim()}”.</p>}
    </div>
  );
}

export function PartsSection({
  form,
  parts,
  componentTerms,
  currency,
  note,
}: {
  form: UseFormReturn<ClaimFormValues>;
  parts: readonly CatalogPart[];
  componentTerms: CatalogModel['componentTerms'];
  currency: string;
  note?: ReturnInfo | null;
}) {
  const { control, register, formState, getValues, setValue, clearErrors, setFocus } = form;
  const { fields } = useFieldArray({ control, name: 'partLines' });
  // after a part is added, focus moves to the new line's first field (its quantity)
  const focusLine = useRef<number | null>(null);
  const append = (line: { partId: string; quantity: number }) => {
    const next = [...(getValues('partLines') ?? []), line];
    focusLine.current = next.length - 1;
    setValue('partLines', next, { shouldDirty: true });
  };
  useEffect(() => {
    const i = focusLine.current;
    if (i === null || i >= fields.length) return;
    focusLine.current = null;
    setFocus(`partLines.${i}.quantity`, { shouldSelect: true });
  }, [fields.length, setFocus]);
  const remove = (i: number) => {
    clearErrors('partLines');
    setValue(
      'partLines',
      (getValues('partLines') ?? []).filter((_, j) => j !== i),
      { shouldDirty: true },
    );
  };
  const lines = useWatch({ control, name: 'partLines' }) ?? [];
  const byId = new Map(parts.map((p) => [p.id, p]));
  const longer = new Map(componentTerms.map((c) => [c.partId, c]));
  const errors = formState.errors.partLines;
  return (
    <FormSection id="section-parts" title="Parts" description="Parts you replaced, from the catalogue. Parts marked “return required” must be sent back before the claim is paid." note={note}>
      {fields.length > 0 && (
        <ol className="divide-y divide-ink-100 rounded-md border border-ink-100">
          {fields.map((field, i) => {
            const part = byId.get(lines[i]?.partId ?? '');
            const term = part ? longer.get(part.id) : undefined;
            const e = errors?.[i];
            return (
              <li key={field.id} className="grid gap-3 p-3 sm:grid-cols-[minmax(0,1fr)_7rem_auto] sm:items-end" aria-label={`Part line ${i + 1}`}>
                <div className="text-sm">
                  <p>
                    <span className="font-mono font-medium">{part?.partNumber ?? 'Unknown part'}</span> {part?.description}
                  </p>
                  <p className="mt-1 flex flex-wrap items-center gap-2 text-ink-700">
                    {part && <span className="tabular-nums">List {formatCents(part.listPriceCents, currency)}</span>}
                    {part?.returnRequired && <Badge tone="orange">Return required</Badge>}
                    {term && <Badge tone="ink">{`${term.label}: ${term.partsMonths}-month parts term`}</Badge>}
                  </p>
                  <GroupError>{e?.partId?.message}</GroupError>
                </div>
                <FormField id={fieldDomId(`partLines.${i}.quantity`)} label="Quantity" error={e?.quantity?.message}>
                  {(p) => <Input {...p} type="text" inputMode="numeric" autoComplete="off" {...register(`partLines.${i}.quantity`, { setValueAs: typedNumberValue })} />}
                </FormField>
                <Button variant="ghost" size="sm" onClick={() => remove(i)}>
                  Remove
                </Button>
              </li>
            );
          })}
        </ol>
      )}
      <GroupError>{errors?.message ?? errors?.root?.message}</GroupError>
      <PartPicker parts={parts} currency={currency} onPick={(p) => append({ partId: p.id, quantity: 1 })} />
    </FormSection>
  );
}
