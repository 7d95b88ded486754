import { describe, expect, it, vi } from 'vitest';
import { render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { agencyRoles } from '@shared/permissions/ability';
import type { UserListItem } from '@shared/schemas/admin';
import { UsersTable } from './users-table';

const person = (over: Partial<UserListItem>): UserListItem => ({
  id: 'u1',
  name: 'Test Person',
  email: 'person@example.test',
  role: 'technician',
  active: true,
  lastSignInAt: null,
  createdAt: '2026-01-01T00:00:00.000Z',
  certification: { summary: 'none', families: [] },
  ...over,
});

describe('UsersTable', () => {
  it('warns about a certificate ending soon and one that ended, and offers only the given roles', async () => {
    const onChangeRole = vi.fn();
    const items = [
      person({
        id: 'a',
        name: 'Ada Example',
        certification: {
          summary: 'expired',
          families: [
            { familyId: 'f1', familyCode: 'F1', familyName: 'Family one', validTo: '2026-07-01', state: 'expiring', daysLeft: 12 },
            { familyId: 'f2', familyCode: 'F2', familyName: 'Family two', validTo: '2026-05-01', state: 'expired', daysLeft: -49 },
          ],
        },
      }),
      person({ id: 'b', name: 'Ben Example', active: false, lastSignInAt: '2026-06-01T10:00:00.000Z' }),
    ];
    render(<UsersTable items={items} roles={agencyRoles} currentUserId="b" pendingId={null} onChangeRole={onChangeRole} onToggleActive={() => {}} onCertifications={() => {}} />);

    const ada = screen.getByRole('row', { name: /Ada Example/ });
    expect(within(ada).getByText('Expired')).toBeInTheDocument();
    expect(within(ada).getByText(/Family one: ends Jul 1, 2026 \(12 days\)/)).toBeInTheDocument();
    expect(within(ada).getByText(/Family two: ended May 1, 2026/)).toBeInTheDocument();
    expect(within(ada).getByText('Never')).toBeInTheDocument();

    const ben = screen.getByRole('row', { name: /Ben Example/ });
    expect(within(ben).getByText('Deactivated')).toBeInTheDocument();
    expect(within(ben).getByRole('button', { name: 'Reactivate' })).toBeInTheDocument();
    expect(within(ben).getByText('(you)')).toBeInTheDocument();

    const select = within(ada).getByRole('combobox', { name: 'Role of Ada Example' });
    expect(within(select).getAllByRole('option').map((o) => o.textContent)).toEqual(['Technician', 'Agency admin']);
    await userEvent.selectOptions(select, 'agency_admin');
    expect(onChangeRole).toHaveBeenCalledWith(expect.objectContaining({ id: 'a' }), 'agency_admin');
  });
});
