import { useId, type FormEvent } from 'react';
import { claimStateLabels, claimStates, type ClaimState } from '@shared/schemas/claim';
import { Button } from '@/components/ui/button';
import { Input, Select } from '@/components/ui/input';
import type { ClaimFilters } from '../filters';

export interface AgencyOption {
  id: string;
  name: string;
}

export interface ClaimFilterBarProps {
  filters: ClaimFilters;
  /** Called with the new filters (the cursor dropped: a new filter starts at page one). */
  onChange: (filters: ClaimFilters) => void;
  /** Agencies to choose from; the select is left out when there are none. */
  agencies: AgencyOption[] | null;
  /** States this user can see claims in (others would always be empty). */
  states?: readonly ClaimState[];
}

function valueOf(form: HTMLFormElement, name: string): string | undefined {
  const el = form.elements.namedItem(name);
  const v = el instanceof HTMLInputElement || el instanceof HTMLSelectElement ? el.value.trim() : '';
  return v || undefined;
}

export function ClaimFilterBar({ filters, onChange, agencies, states = claimStates }: ClaimFilterBarProps) {
  const id = useId();
  const read = (form: HTMLFormElement): ClaimFilters => ({
    state: valueOf(form, 'state') as ClaimState | undefined,
    agency: valueOf(form, 'agency'),
    q: valueOf(form, 'q'),
    from: valueOf(form, 'from'),
    to: valueOf(form, 'to'),
    sort: filters.sort,
    dir: filters.dir,
  });
  const submit = (e: FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    onChange(read(e.currentTarget));
  };
  // Selects apply at once, dates when the field is left (a half-typed year must not
  // reload the list); the search box applies on Enter or the button.
  const applyNow = (e: FormEvent<HTMLSelectElement | HTMLInputElement>) => {
    const form = e.currentTarget.form;
    if (form) onChange(read(form));
  };
  const applyDate = (e: FormEvent<HTMLInputElement>) => {
    const name = e.currentTarget.name as 'from' | 'to';
    if ((e.currentTarget.value || undefined) !== filters[name]) applyNow(e);
  };
  const key = JSON.stringify(filters);
  const label = 'block text-xs font-semibold uppercase tracking-wide text-ink-700';

  return (
    <form role="search" aria-label="Filter claims" onSubmit={submit} key={key} className="grid grid-cols-2 gap-3 lg:grid-cols-[minmax(14rem,2fr)_repeat(4,minmax(8rem,1fr))_auto] lg:items-end">
      <div className="col-span-2 lg:col-span-1">
        <label htmlFor={`${id}-q`} className={label}>
          Search
        </label>
        <Input id={`${id}-q`} name="q" type="search" defaultValue={filters.q ?? ''} placeholder="Claim number or serial" autoComplete="off" enterKeyHint="search" />
      </div>
      <div className={agencies && agencies.length > 0 ? 'col-span-2 sm:col-span-1' : 'col-span-2 lg:col-span-1'}>
        <label htmlFor={`${id}-state`} className={label}>
          State
        </label>
        <Select id={`${id}-state`} name="state" defaultValue={filters.state ?? ''} onChange={applyNow}>
          <option value="">All states</option>
          {states.map((s) => (
            <option key={s} value={s}>
              {claimStateLabels[s]}
            </option>
          ))}
        </Select>
      </div>
      {agencies && agencies.length > 0 ? (
        <div className="col-span-2 sm:col-span-1">
          <label htmlFor={`${id}-agency`} className={label}>
            Service agency
          </label>
          <Select id={`${id}-agency`} name="agency" defaultValue={filters.agency ?? ''} onChange={applyNow}>
            <option value="">All agencies</option>
            {agencies.map((a) => (
              <option key={a.id} value={a.id}>
                {a.name}
              </option>
            ))}
          </Select>
        </div>
      ) : (
        <input type="hidden" name="agency" value={filters.agency ?? ''} />
      )}
      <div>
        <label htmlFor={`${id}-from`} className={label}>
          Repaired from
        </label>
        <Input id={`${id}-from`} name="from" type="date" defaultValue={filters.from ?? ''} max={filters.to} onBlur={applyDate} />
      </div>
      <div>
        <label htmlFor={`${id}-to`} className={label}>
          Repaired to
        </label>
        <Input id={`${id}-to`} name="to" type="date" defaultValue={filters.to ?? ''} min={filters.from} onBlur={applyDate} />
      </div>
      <div className="col-span-2 flex gap-2 lg:col-span-1">
        <Button type="submit">Search</Button>
        <Button type="button" variant="ghost" onClick={() => onChange({ sort: filters.sort, dir: filters.dir })}>
          Clear
        </Button>
      </div>
    </form>
  );
}
