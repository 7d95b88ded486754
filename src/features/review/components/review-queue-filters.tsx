import { useEffect, useState } from 'react';
import { FLAG_CODES, FLAG_INFO } from '@shared/calculations/flags';
import type { CatalogModel } from '@shared/schemas/catalog';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { Input, Select } from '@/components/ui/input';
import type { ReviewQueueFilters } from '../queue-filters';

export interface AgencyOption {
  id: string;
  name: string;
}

/** The queue's filters: state, agency, flag, model and a claimed-amount range. */
export function ReviewQueueFilterBar({
  filters,
  agencies,
  models,
  onChange,
}: {
  filters: ReviewQueueFilters;
  agencies: AgencyOption[];
  models: CatalogModel[];
  onChange: (next: ReviewQueueFilters) => void;
}) {
  const [min, setMin] = useState(filters.min ?? '');
  const [max, setMax] = useState(filters.max ?? '');
  useEffect(() => {
    setMin(filters.min ?? '');
    setMax(filters.max ?? '');
  }, [filters.min, filters.max]);
  const set = (patch: Partial<ReviewQueueFilters>) => onChange({ ...filters, ...patch, cursor: undefined });
  const any = Boolean(filters.status || filters.agency || filters.flag || filters.model || filters.min || filters.max);
  const [shown, setShown] = useState(false);
  const count = [filters.status, filters.agency, filters.flag, filters.model, filters.min || filters.max].filter(Boolean).length;
  return (
    <>
    <Button variant="secondary" size="sm" className="sm:hidden" aria-expanded={shown} aria-controls="queue-filters" onClick={() => setShown((s) => !s)}>
      {shown ? 'Hide filters' : count > 0 ? `Filters (${count})` : 'Filters'}
    </Button>
    <form
      id="queue-filters"
      role="search"
      aria-label="Filter the review queue"
      className={`${shown ? 'mt-3 grid' : 'hidden'} gap-3 sm:mt-0 sm:grid sm:grid-cols-2 lg:grid-cols-[repeat(4,minmax(0,1fr))_minmax(0,1.4fr)_auto] lg:items-end`}
      onSubmit={(e) => {
        e.preventDefault();
        set({ min: min.trim() || undefined, max: max.trim() || undefined });
      }}
    >
      <Field label="State">
        {(p) => (
          <Select {...p} value={filters.status ?? ''} onChange={(e) => set({ status: (e.target.value || undefined) as ReviewQueueFilters['status'] })}>
            <option value="">All in the queue</option>
            <option value="submitted">Waiting for a reviewer</option>
            <option value="in_review">In review</option>
          </Select>
        )}
      </Field>
      <Field label="Service agency">
        {(p) => (
          <Select {...p} value={filters.agency ?? ''} onChange={(e) => set({ agency: e.target.value || undefined })}>
            <option value="">All agencies</option>
            {agencies.map((a) => (
              <option key={a.id} value={a.id}>
                {a.name}
              </option>
            ))}
          </Select>
        )}
      </Field>
      <Field label="Flag">
        {(p) => (
          <Select {...p} value={filters.flag ?? ''} onChange={(e) => set({ flag: (e.target.value || undefined) as ReviewQueueFilters['flag'] })}>
            <option value="">Any or none</option>
            {FLAG_CODES.map((f) => (
              <option key={f} value={f}>
                {FLAG_INFO[f].label}
              </option>
            ))}
          </Select>
        )}
      </Field>
      <Field label="Model">
        {(p) => (
          <Select {...p} value={filters.model ?? ''} onChange={(e) => set({ model: e.target.value || undefined })}>
            <option value="">All models</option>
            {models.map((m) => (
              <option key={m.id} value={m.id}>
                {m.modelNumber}
              </option>
            ))}
          </Select>
        )}
      </Field>
      <fieldset className="grid grid-cols-2 gap-2">
        <legend className="mb-1 text-sm font-medium text-ink-800">Allowed amount ($)</legend>
        <label className="sr-only" htmlFor="queue-min">
          At least
        </label>
        <Input id="queue-min" inputMode="decimal" placeholder="from" value={min} onChange={(e) => setMin(e.target.value)} onBlur={() => set({ min: min.trim() || undefined, max: max.trim() || undefined })} />
        <label className="sr-only" htmlFor="queue-max">
          At most
        </label>
        <Input id="queue-max" inputMode="decimal" placeholder="to" value={max} onChange={(e) => setMax(e.target.value)} onBlur={() => set({ min: min.trim() || undefined, max: max.trim() || undefined })} />
      </fieldset>
      <div className="flex gap-2">
        <Button type="submit" variant="secondary">
          Apply
        </Button>
        {any && (
          <Button variant="ghost" onClick={() => onChange({})}>
            Clear
          </Button>
        )}
      </div>
    </form>
    </>
  );
}
