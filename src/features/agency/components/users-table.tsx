import { useMemo } from 'react';
import { createColumnHelper, flexRender, getCoreRowModel, getSortedRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import { useState } from 'react';
import { roleLabels, type Role } from '@shared/permissions/ability';
import type { UserListItem } from '@shared/schemas/admin';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Select } from '@/components/ui/input';
import { Table, TBody, Td, Th, THead, Tr } from '@/components/ui/table';
import { formatDate, formatDateTime } from '@/lib/format';
import { CertificationBadge } from './certification-badge';

const column = createColumnHelper<UserListItem>();

export interface UsersTableProps {
  items: UserListItem[];
  roles: readonly Role[];
  currentUserId: string | undefined;
  /** The row whose change is being saved. */
  pendingId: string | null;
  onChangeRole: (user: UserListItem, role: Role) => void;
  onToggleActive: (user: UserListItem) => void;
  /** Agency side only: open the user's certifications. */
  onCertifications?: (user: UserListItem) => void;
}

/** People of one organisation with role, status, last sign-in and (agencies) certification state. */
export function UsersTable({ items, roles, currentUserId, pendingId, onChangeRole, onToggleActive, onCertifications }: UsersTableProps) {
  const [sorting, setSorting] = useState<SortingState>([{ id: 'name', desc: false }]);
  const columns = useMemo(
    () => [
      column.accessor('name', {
        id: 'name',
        header: 'Name',
        cell: (c) => (
          <span className="flex flex-col">
            <span className="font-medium text-ink-900">
              {c.getValue()}
              {c.row.original.id === currentUserId && <span className="ml-1 text-xs text-ink-600">(you)</span>}
            </span>
            <span className="text-xs text-ink-600">{c.row.original.email}</span>
          </span>
        ),
      }),
      column.accessor('role', {
        id: 'role',
        header: 'Role',
        cell: (c) => (
          <Select
            aria-label={`Role of ${c.row.original.name}`}
            value={c.getValue()}
            disabled={pendingId === c.row.original.id}
            onChange={(e) => onChangeRole(c.row.original, e.target.value as Role)}
            className="min-h-9 w-auto py-1 text-sm"
          >
            {roles.map((r) => (
              <option key={r} value={r}>
                {roleLabels[r]}
              </option>
            ))}
          </Select>
        ),
      }),
      column.accessor('active', {
        id: 'status',
        header: 'Status',
        cell: (c) => (c.getValue() ? <Badge tone="green">Active</Badge> : <Badge tone="slate">Deactivated</Badge>),
      }),
      column.accessor('lastSignInAt', {
        id: 'lastSignIn',
        header: 'Last sign-in',
        sortingFn: 'alphanumeric',
        cell: (c) => (c.getValue() ? formatDateTime(c.getValue()) : <span className="text-ink-600">Never</span>),
      }),
      ...(onCertifications
        ? [
            column.accessor((u) => u.certification.summary, {
              id: 'certification',
              header: 'Certification',
              enableSorting: false,
              cell: (c) => {
                const cert = c.row.original.certification;
                const warn = cert.families.filter((f) => f.state === 'expiring' || f.state === 'expired');
                return (
                  <span className="flex flex-col items-start gap-1">
                    <CertificationBadge state={cert.summary} />
                    {warn.map((f) => (
                      <span key={f.familyId} className={f.state === 'expired' ? 'text-xs text-red-800' : 'text-xs text-brass-700'}>
                        {f.familyName}: {f.state === 'expired' ? `ended ${formatDate(f.validTo)}` : `ends ${formatDate(f.validTo)} (${f.daysLeft} days)`}
                      </span>
                    ))}
                  </span>
                );
              },
            }),
          ]
        : []),
      column.display({
        id: 'actions',
        header: 'Actions',
        cell: (c) => (
          <span className="flex flex-wrap justify-end gap-2">
            {onCertifications && (
              <Button size="sm" variant="secondary" onClick={() => onCertifications(c.row.original)}>
                Certifications
              </Button>
            )}
            <Button size="sm" variant={c.row.original.active ? 'ghost' : 'secondary'} pending={pendingId === c.row.original.id} onClick={() => onToggleActive(c.row.original)}>
              {c.row.original.active ? 'Deactivate' : 'Reactivate'}
            </Button>
          </span>
        ),
      }),
    ],
    [roles, currentUserId, pendingId, onChangeRole, onToggleActive, onCertifications],
  );

  const table = useReactTable({ data: items, columns, state: { sorting }, onSortingChange: setSorting, getCoreRowModel: getCoreRowModel(), getSortedRowModel: getSortedRowModel() });

  return (
    <Table caption="Users">
      <THead>
        {table.getHeaderGroups().map((hg) => (
          <Tr key={hg.id}>
            {hg.headers.map((h) => {
              const sorted = h.column.getIsSorted();
              return (
                <Th key={h.id} aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}>
                  {h.column.getCanSort() ? (
                    <button type="button" className="inline-flex items-center gap-1 uppercase" onClick={h.column.getToggleSortingHandler()}>
                      {flexRender(h.column.columnDef.header, h.getContext())}
                      <span aria-hidden="true">{sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : ''}</span>
                    </button>
                  ) : (
                    flexRender(h.column.columnDef.header, h.getContext())
                  )}
                </Th>
              );
            })}
          </Tr>
        ))}
      </THead>
      <TBody>
        {table.getRowModel().rows.map((row) => (
          <Tr key={row.id} className={row.original.active ? undefined : 'bg-ink-50/60'}>
            {row.getVisibleCells().map((cell) => (
              <Td key={cell.id}>{flexRender(cell.column.columnDef.cell, cell.getContext())}</Td>
            ))}
          </Tr>
        ))}
      </TBody>
    </Table>
  );
}
