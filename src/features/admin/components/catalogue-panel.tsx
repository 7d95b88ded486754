import { useState, type ReactNode } from 'react';
import type { AffectedClaims } from '@shared/schemas/admin';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Modal } from '@/components/ui/modal';
import { Skeleton } from '@/components/ui/skeleton';
import { Table, TBody, Td, Th, THead, Tr } from '@/components/ui/table';
import { errorMessage } from '@/lib/api-client';
import { formatDate } from '@/lib/format';

/** One column of a catalogue table: its header, and what a row shows in it. */
export type CatalogueColumn<T> = { header: string; className?: string; cellClassName?: string; cell: (row: T) => ReactNode };

type ListQuery<T> = { isPending: boolean; isError: boolean; error: unknown; data: T[] | undefined };

type CataloguePanelProps<T extends { id: string }> = {
  title: string;
  description: string;
  /** The table's caption (its accessible name). */
  caption: string;
  /** The button that opens the create form, and the create dialog's title. */
  newLabel: string;
  newTitle: string;
  /** The row's Edit button's accessible name, also the edit dialog's title, e.g. "Edit part P-100". */
  editLabel: (row: T | undefined) => string;
  query: ListQuery<T>;
  columns: CatalogueColumn<T>[];
  skeletonClassName?: string;
  renderCreate: (onDone: () => void) => ReactNode;
  renderEdit: (row: T, onDone: () => void) => ReactNode;
};

/**
 * The list-and-form shape every catalogue table shares: a card with a "New" action, the list
 * (loading, error, table with an Edit button a row) and one dialog for the create or edit form.
 * The selection is kept by id, so the edit form sees the row as the list refetches it.
 */
export function CataloguePanel<T extends { id: string }>(props: CataloguePanelProps<T>) {
  const { query, columns } = props;
  const [selected, setSelected] = useState<string | 'new' | null>(null);
  const current = selected && selected !== 'new' ? query.data?.find((r) => r.id === selected) : undefined;
  const close = () => setSelected(null);
  return (
    <Card>
      <CardHeader title={props.title} description={props.description} actions={<Button onClick={() => setSelected('new')}>{props.newLabel}</Button>} />
      {query.isPending && <Skeleton className={props.skeletonClassName ?? 'm-4 h-40'} />}
      {query.isError && (
        <CardBody>
          <Alert tone="error">{errorMessage(query.error)}</Alert>
        </CardBody>
      )}
      {query.data && (
        <Table caption={props.caption}>
          <THead>
            <Tr>
              {columns.map((c) => (
                <Th key={c.header} className={c.className}>
                  {c.header}
                </Th>
              ))}
              <Th>Actions</Th>
            </Tr>
          </THead>
          <TBody>
            {query.data.map((row) => (
              <Tr key={row.id}>
                {columns.map((c) => (
                  <Td key={c.header} className={c.cellClassName ?? c.className}>
                    {c.cell(row)}
                  </Td>
                ))}
                <Td className="text-right">
                  <Button size="sm" variant="secondary" onClick={() => setSelected(row.id)} aria-label={props.editLabel(row)}>
                    Edit
                  </Button>
                </Td>
              </Tr>
            ))}
          </TBody>
        </Table>
      )}
      <Modal open={selected !== null} onClose={close} title={selected === 'new' ? props.newTitle : props.editLabel(current)}>
        {selected === 'new' && props.renderCreate(close)}
        {current && props.renderEdit(current, close)}
      </Modal>
    </Card>
  );
}

export function StatusBadge({ active }: { active: boolean }) {
  return active ? <Badge tone="green">Active</Badge> : <Badge tone="slate">Retired</Badge>;
}

const HISTORY_START = '0001-01-01';
/** "from the start" for the first dated value, else "from <date>". */
export const since = (d: string) => (d === HISTORY_START ? 'from the start' : `from ${formatDate(d)}`);
export const today = () => new Date().toISOString().slice(0, 10);

/** A dated value with the values scheduled after today, for a table cell. */
export function DatedValue<S extends { effectiveFrom: string }>({ now, scheduled, show }: { now: ReactNode; scheduled: S[]; show: (s: S) => ReactNode }) {
  return (
    <>
      {now}
      {scheduled.map((s) => (
        <span key={s.effectiveFrom} className="block text-xs text-brass-700">
          {show(s)} {since(s.effectiveFrom)}
        </span>
      ))}
    </>
  );
}

/** The dated values so far, under an edit form. */
export function DatedHistory<S extends { effectiveFrom: string }>({ title, items, show }: { title: string; items: S[] | undefined; show: (s: S) => ReactNode }) {
  if (!items || items.length === 0) return null;
  return (
    <div className="text-sm">
      <p className="font-medium text-ink-800">{title}</p>
      <ul className="text-ink-700">
        {items.map((h) => (
          <li key={h.effectiveFrom}>
            {show(h)} {since(h.effectiveFrom)}
          </li>
        ))}
      </ul>
    </div>
  );
}

/** After a back-dated change: which filed claims it changed, and a way to close. */
export function AffectedClaimsNotice({ what, affected, onClose }: { what: string; affected: AffectedClaims; onClose: () => void }) {
  return (
    <Alert tone="info">
      Saved. The {what} takes effect from {affected.effectiveFrom} and changes {affected.count} filed {affected.count === 1 ? 'claim' : 'claims'}
      {affected.numbers.length > 0 ? `: ${affected.numbers.join(', ')}${affected.count > affected.numbers.length ? ' and more' : ''}` : ''}.{' '}
      <button type="button" className="underline" onClick={onClose}>
        Close
      </button>
    </Alert>
  );
}

export function ActiveCheckbox({ registration }: { registration: object }) {
  return (
    <label className="flex items-center gap-2 text-sm">
      <input type="checkbox" className="size-4" {...registration} /> Active (untick to retire)
    </label>
  );
}
