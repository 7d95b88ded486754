import { useMemo } from 'react';
import { Link } from 'react-router';
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import type { ClaimListItem } from '@shared/schemas/claim';
import { flagLabel } from '@shared/calculations/flags';
import { paths } from '@/config/paths';
import { cx } from '@/lib/cx';
import { formatCents, formatDate } from '@/lib/format';
import type { ClaimSortKey, SortDir } from '../filters';
import { ClaimStateBadge } from './claim-state-badge';

const column = createColumnHelper<ClaimListItem>();

/** Dates and money sort newest/largest first on the first click; text sorts A to Z. */
const firstDir: Record<ClaimSortKey, SortDir> = {
  createdAt: 'desc',
  submittedAt: 'desc',
  repairDate: 'desc',
  claimedTotalCents: 'desc',
  number: 'asc',
  state: 'asc',
};

export function nextSort(current: { sort?: ClaimSortKey; dir?: SortDir }, key: ClaimSortKey): { sort: ClaimSortKey; dir: SortDir } {
  if (current.sort === key) return { sort: key, dir: current.dir === 'asc' ? 'desc' : 'asc' };
  return { sort: key, dir: firstDir[key] };
}

function unitText(c: ClaimListItem): string {
  return [c.modelNumber, c.serial].filter(Boolean).join(' · ') || '—';
}

export interface ClaimsTableProps {
  items: ClaimListItem[];
  sort?: ClaimSortKey;
  dir?: SortDir;
  onSort: (next: { sort: ClaimSortKey; dir: SortDir }) => void;
  showAgency: boolean;
}

export function ClaimsTable({ items, sort, dir, onSort, showAgency }: ClaimsTableProps) {
  const columns = useMemo(
    () => [
      column.accessor('number', {
        id: 'number',
        header: 'Claim',
        enableSorting: true,
        cell: (c) => (
          <span className="flex flex-col">
            <Link to={paths.claim(c.row.original.id)} className="font-semibold text-ink-800 underline-offset-2 hover:underline">
              {c.getValue()}
            </Link>
            {c.row.original.flags.length > 0 && (
              <span className="text-xs text-brass-700" title={c.row.original.flags.map(flagLabel).join(', ')}>
                {c.row.original.flags.length === 1 ? flagLabel(c.row.original.flags[0]) : `${c.row.original.flags.length} flags`}
              </span>
            )}
          </span>
        ),
      }),
      column.accessor('state', { id: 'state', header: 'State', enableSorting: true, cell: (c) => <ClaimStateBadge state={c.getValue()} /> }),
      column.accessor('agencyName', { id: 'agency', header: 'Service agency', enableSorting: false }),
      column.accessor('technicianName', { id: 'technician', header: 'Technician', enableSorting: false }),
      column.display({
        id: 'unit',
        header: 'Unit and site',
        cell: (c) => (
          <span className="flex flex-col">
            <span>{unitText(c.row.original)}</span>
            {c.row.original.siteName && <span className="text-xs text-ink-600">{c.row.original.siteName}</span>}
          </span>
        ),
      }),
      column.accessor('repairDate', { id: 'repairDate', header: 'Repair date', enableSorting: true, cell: (c) => formatDate(c.getValue()) }),
      column.accessor('submittedAt', { id: 'submittedAt', header: 'Submitted', enableSorting: true, cell: (c) => formatDate(c.getValue()?.slice(0, 10)) }),
      column.accessor('claimedTotalCents', {
        id: 'claimedTotalCents',
        header: 'Allowed',
        enableSorting: true,
        meta: { numeric: true },
        cell: (c) => formatCents(c.getValue(), c.row.original.currency),
      }),
      column.accessor('approvedTotalCents', {
        id: 'approved',
        header: 'Approved',
        enableSorting: false,
        meta: { numeric: true },
        cell: (c) => formatCents(c.getValue(), c.row.original.currency),
      }),
    ],
    [],
  );

  const sorting: SortingState = sort ? [{ id: sort, desc: dir !== 'asc' }] : [];
  const table = useReactTable({
    data: items,
    columns,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (row) => row.id,
    manualSorting: true,
    manualPagination: true,
    enableSortingRemoval: false,
    state: { sorting, columnVisibility: { agency: showAgency } },
  });

  return (
    <>
      {/* Phone: one card per claim. */}
      <ul className="divide-y divide-ink-100 md:hidden" aria-label="Claims">
        {items.map((c) => (
          <li key={c.id} className="px-4 py-3">
            <div className="flex items-start justify-between gap-2">
              <Link to={paths.claim(c.id)} className="font-semibold text-ink-800 underline underline-offset-2">
                {c.number}
              </Link>
              <ClaimStateBadge state={c.state} />
            </div>
            <p className="mt-1 text-sm text-ink-700">{unitText(c)}</p>
            <p className="text-sm text-ink-600">{[showAgency ? c.agencyName : null, c.technicianName, c.siteName].filter(Boolean).join(' · ')}</p>
            <p className="mt-1 flex flex-wrap justify-between gap-x-4 text-sm">
              <span>Repair {formatDate(c.repairDate)}</span>
              <span className="font-medium tabular-nums">
                {formatCents(c.claimedTotalCents, c.currency)}
                {c.approvedTotalCents !== null && <span className="text-ink-600"> · approved {formatCents(c.approvedTotalCents, c.currency)}</span>}
              </span>
            </p>
          </li>
        ))}
      </ul>
      {/* Desk: a sortable table. */}
      <div className="hidden overflow-x-auto md:block">
        <table className="w-full border-collapse text-left text-sm">
          <caption className="sr-only">Claims. Column headers with a button sort the list.</caption>
          <thead className="border-b border-ink-200 bg-ink-50 text-xs uppercase tracking-wide text-ink-700">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const numeric = (header.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                  const sorted = header.column.getIsSorted();
                  const label = flexRender(header.column.columnDef.header, header.getContext());
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
                      className={cx('px-3 py-2 font-semibold', numeric && 'text-right')}
                    >
                      {header.column.getCanSort() ? (
                        <button
                          type="button"
                          onClick={() => onSort(nextSort({ sort, dir }, header.column.id as ClaimSortKey))}
                          className={cx('inline-flex items-center gap-1 uppercase hover:text-ink-900', numeric && 'flex-row-reverse')}
                        >
                          {label}
                          <SortMark dir={sorted} />
                        </button>
                      ) : (
                        label
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-ink-100 bg-white">
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="align-top hover:bg-paper">
                {row.getVisibleCells().map((cell) => {
                  const numeric = (cell.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                  return (
                    <td key={cell.id} className={cx('px-3 py-2', numeric && 'text-right tabular-nums')}>
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </>
  );
}

function SortMark({ dir }: { dir: false | 'asc' | 'desc' }) {
  return (
    <svg aria-hidden="true" viewBox="0 0 10 12" className={cx('size-3', dir ? 'text-ink-800' : 'text-ink-300')} fill="currentColor">
      {dir !== 'desc' && <path d="M5 1l4 4H1z" />}
      {dir !== 'asc' && <path d="M5 11l4-4H1z" />}
    </svg>
  );
}

export function ClaimsTableSkeleton({ rows = 6 }: { rows?: number }) {
  return (
    <div aria-hidden="true" className="divide-y divide-ink-100">
      {Array.from({ length: rows }, (_, i) => (
        <div key={i} className="flex items-center gap-4 px-4 py-3">
          <span className="h-4 w-28 animate-pulse rounded bg-ink-100" />
          <span className="h-4 w-20 animate-pulse rounded-full bg-ink-100" />
          <span className="hidden h-4 flex-1 animate-pulse rounded bg-ink-100 sm:block" />
          <span className="h-4 w-16 animate-pulse rounded bg-ink-100" />
        </div>
      ))}
    </div>
  );
}
